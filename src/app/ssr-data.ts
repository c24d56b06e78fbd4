// What the server hands the browser beside server-rendered HTML: the query data that HTML was rendered from, as
// JSON in <script type="application/json" id={SSR_DATA_ID}> (data, not code: the CSP allows no inline script).
export const SSR_DATA_ID = 'lk-ssr-data';

/** `updatedAt`: when the server read the data (ms since 1970), so a query refetches what is stale for its age. */
export type SeededQuery = { key: readonly unknown[]; data: unknown; updatedAt: number };
