/// <reference types="vitest/config" />
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { eagerCommonJsWrappers } from './scripts/lib/eager-cjs-wrappers';
import { readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const apiPort = Number(process.env.PORT ?? 3000);

export default defineConfig({
  plugins: [
    react(),
    tailwindcss(),
    {
      // The Open Graph image of the public pages, drawn by us as SVG and rendered to PNG at build time.
      name: 'lightkeel-og-image',
      apply: 'build',
      async generateBundle() {
        const { renderOgImagePng } = await import('./scripts/lib/og-image');
        this.emitFile({ type: 'asset', fileName: 'og/lightkeel.png', source: renderOgImagePng() });
      },
    },
    {
      // The fonts of the first screen are fetched beside the stylesheet, not after the first layout finds the text
      // that uses them: the headline then paints once, in its own face, without a late swap and a second layout.
      name: 'lightkeel-font-preload',
      apply: 'build',
      transformIndexHtml: {
        order: 'post',
        handler: (_html, { bundle }) =>
          Object.keys(bundle ?? {})
            .filter((file) => /nunito-sans-latin-(400|600|700)-normal-[\w-]+\.woff2$/.test(file))
            .sort()
            .map((file) => ({
              tag: 'link',
              attrs: { rel: 'preload', href: `/${file}`, as: 'font', type: 'font/woff2', crossorigin: '' },
              injectTo: 'head' as const,
            })),
      },
    },
    {
      // Every function of the shell runs on the first load (React, the router, the query client, the page's top):
      // the file-wide compile hint has Chromium compile them while it streams the file in, on a background thread,
      // instead of one by one on the main thread when each is first called during hydration. Other browsers ignore
      // the comment. It must open the file.
      name: 'lightkeel-compile-hints',
      apply: 'build',
      enforce: 'post',
      // (Written into the file once it is on disk: Vite adds its own preamble to the chunk after every other hook.)
      async writeBundle({ dir }, bundle) {
        for (const chunk of Object.values(bundle)) {
          if (chunk.type !== 'chunk' || chunk.name !== 'shell' || !dir) continue;
          const file = path.join(dir, chunk.fileName);
          const code = eagerCommonJsWrappers(await readFile(file, 'utf8'), bundle, (m) => this.warn(m));
          await writeFile(file, `//# allFunctionsCalledOnLoad\n${code}`);
          // A source map, when one is written, starts one line further down.
          const map = bundle[`${chunk.fileName}.map`];
          if (map?.type === 'asset') {
            const json = JSON.parse(await readFile(`${file}.map`, 'utf8')) as { mappings: string };
            await writeFile(`${file}.map`, JSON.stringify({ ...json, mappings: `;${json.mappings}` }));
          }
        }
      },
    },
  ],
  resolve: {
    alias: {
      // react-router-dom only re-exports react-router plus the data router's DOM provider, which we do not use;
      // its production build leaves out the development warnings.
      'react-router-dom': fileURLToPath(new URL('./node_modules/react-router/dist/production/index.mjs', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
      '@': fileURLToPath(new URL('./src', import.meta.url)),
    },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    chunkSizeWarningLimit: 1500,
    // Every browser the site supports knows <link rel="modulepreload">: the polyfill would be dead weight in the entry.
    modulePreload: { polyfill: false },
    rollupOptions: {
      output: {
        // Every page needs React, the router, the query client and the site's shell (layouts, header, route tree):
        // one file compresses better than several and saves requests. The shell carries the top of the mission page;
        // the mission page's lower sections (src/app/routes/home-sections.tsx) are a chunk of their own, fetched when
        // the visitor scrolls to them (the server has already sent their HTML). Every other page stays split per page.
        codeSplitting: {
          groups: [
            {
              name: 'shell',
              test: new RegExp(
                [
                  // (mutations are for forms on other pages: their hooks load with those pages)
                  'node_modules/(react|react-dom|scheduler|react-router|react-router-dom|@tanstack/(react-query|query-core))/(?!.*/(useMutation|mutationObserver)\\.js$)',
                  '(' +
                    [
                      'src/lib/(api-client|cn|document-title|roles|return-to|query-client|when-near)',
                      'src/components/ui/(button|spinner|theme-toggle)',
                      'src/app/(router|route-tree|provider|ssr-data|layouts/(public-layout|root-layout|site-header|account-links|site-footer|skip-link|wordmark|use-disclosure))',
                      'src/app/(routes/(not-found|route-error|home)|site-map/public-pages)',
                      'src/features/auth/api/get-me',
                      'shared/roles',
                    ].join('|') +
                    ')\\.tsx?$',
                ]
                  .map((p) => p.replaceAll('/', '[\\\\/]'))
                  .join('|'),
              ),
            },
          ],
        },
      },
    },
  },
  // satellite.js also ships an optional WebAssembly build with a threaded worker (top-level await): ES workers build it.
  worker: { format: 'es' },
  server: {
    host: '127.0.0.1',
    port: Number(process.env.VITE_PORT ?? 5173),
    proxy: { '/api': `http://127.0.0.1:${apiPort}`, '/snapshots': `http://127.0.0.1:${apiPort}` },
  },
  test: {
    include: ['tests/**/*.test.ts', 'shared/**/*.test.ts', 'server/**/*.test.ts', 'fakes/**/*.test.ts'],
    exclude: ['tests/e2e/**', 'node_modules/**'],
    environment: 'node',
    globalSetup: ['tests/setup/global-setup.ts'],
    setupFiles: ['tests/setup/setup-test-env.ts'],
    testTimeout: 30_000,
    hookTimeout: 60_000,
    pool: 'forks',
    maxWorkers: 2,
  },
});
