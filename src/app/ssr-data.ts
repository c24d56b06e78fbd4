// What the server hands the browser beside server-rendered HTML: the query data that HTML was rendered from, as
// JSON in <script type="application/json" id={SSR_DATA_ID}> (data, not code: the CSP allows no inline script).
export const SSR_DATA_ID = 'lk-ssr-data';

export type SeededQuery = { key: readonly unknown[]; data: unknown };
