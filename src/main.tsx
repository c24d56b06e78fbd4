import { StrictMode, startTransition } from 'react';
import { createRoot, hydrateRoot } from 'react-dom/client';
import { BrowserRouter } from 'react-router-dom';
import '@fontsource/nunito-sans/latin-400.css';
import '@fontsource/nunito-sans/latin-600.css';
import '@fontsource/nunito-sans/latin-700.css';
import './index.css';
import { AppProvider, createAppQueryClient } from '@/app/provider';
import { AppRoutes } from '@/app/router';
import { SSR_DATA_ID, type SeededQuery } from '@/app/ssr-data';

const root = document.getElementById('root');
if (!root) throw new Error('index.html has no #root element');

// Server-rendered pages (src/entry-server.tsx) bring the data their HTML was rendered from: the queries start
// with it, so hydration renders exactly that HTML and nothing is fetched twice.
const client = createAppQueryClient();
const seeded = document.getElementById(SSR_DATA_ID);
if (seeded?.textContent)
  for (const q of JSON.parse(seeded.textContent) as SeededQuery[]) client.setQueryData(q.key, q.data, { updatedAt: q.updatedAt });

const app = (
  <StrictMode>
    <AppProvider client={client}>
      <BrowserRouter>
        <AppRoutes />
      </BrowserRouter>
    </AppProvider>
  </StrictMode>
);

if (seeded) {
  // The page is already painted: hydrate it as a transition, in slices that leave the main thread free for the
  // visitor (a scroll or a tap is never stuck behind it).
  startTransition(() => {
    hydrateRoot(root, app);
  });
} else {
  createRoot(root).render(app);
}
