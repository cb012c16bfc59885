import { defineConfig } from 'vitest/config';
import type { Plugin } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { fileURLToPath } from 'node:url';
import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { brotliCompress, constants as zlib, gzip as gzipCb } from 'node:zlib';

const brotli = promisify(brotliCompress);
const gzip = promisify(gzipCb);

const here = fileURLToPath(new URL('.', import.meta.url));
const apiTarget = `http://127.0.0.1:${process.env.PORT ?? '8080'}`;

/**
 * Libraries in chunks of their own, named after them: a release that changes only the app's
 * code leaves their files (and the browser's cached copies) as they were, and each screen
 * loads only the ones it uses (charts, tables, forms and zod are not part of the shell).
 */
const lib = (names: string) => new RegExp(`[\\\\/]node_modules[\\\\/](${names})[\\\\/]`);
const vendorChunks = [
  { name: 'react', test: lib('react|react-dom|scheduler') },
  { name: 'router', test: lib('react-router|react-router-dom|cookie|set-cookie-parser') },
  { name: 'query', test: lib('@tanstack[\\\\/](?:query-core|react-query)') },
  { name: 'zod', test: lib('zod') },
  { name: 'table', test: lib('@tanstack[\\\\/](?:table-core|react-table)') },
  { name: 'forms', test: lib('react-hook-form|@hookform') },
  // ECharts' core and what every chart uses; the polar axes stay with the one chart that
  // draws on them (components/charts/echarts-polar.ts).
  {
    name: 'echarts',
    test: /[\\/]node_modules[\\/](echarts|zrender|tslib)[\\/](?!.*(polar|angle|radius))/i,
  },
];

/**
 * index.html asks for the signed-in layout's code beside the main script: every screen but
 * sign-in needs it, and the app would only ask for it once the main script has run. (The
 * session needs no schema on a direct load: the page carries it, features/auth/api/get-me.ts.)
 */
function preloadSignedInLayout(): Plugin {
  return {
    name: 'turnstone-preload-layout',
    apply: 'build',
    transformIndexHtml: {
      order: 'post',
      handler(_html, ctx) {
        const chunks = Object.values(ctx.bundle ?? {}).filter((c) => c.type === 'chunk');
        const layout = chunks.find((c) =>
          c.facadeModuleId?.endsWith('/src/app/routes/app/root.tsx'),
        );
        if (!layout || !ctx.chunk) return;
        const loaded = new Set([ctx.chunk.fileName, ...ctx.chunk.imports]);
        const files: string[] = [];
        const add = (fileName: string) => {
          if (loaded.has(fileName)) return;
          loaded.add(fileName);
          files.push(fileName);
          const chunk = chunks.find((c) => c.fileName === fileName);
          chunk?.imports.forEach(add);
        };
        add(layout.fileName);
        return files.map((f) => ({
          tag: 'link',
          attrs: { rel: 'modulepreload', crossorigin: true, href: `/${f}` },
          injectTo: 'head' as const,
        }));
      },
    },
  };
}

/**
 * index.html asks for the fonts' Latin files (the weights main.tsx imports) with the page:
 * the browser would otherwise ask for each only once text in it is laid out, after the
 * scripts have run and the first screen has rendered, and lay the page out again as each
 * arrives (font-display: swap).
 */
function preloadFonts(): Plugin {
  return {
    name: 'turnstone-preload-fonts',
    apply: 'build',
    transformIndexHtml: {
      order: 'post',
      handler(_html, ctx) {
        return Object.keys(ctx.bundle ?? {})
          .filter((f) => /\/(?:inter|roboto-mono)-latin-\d+-normal-[\w-]+\.woff2$/.test(`/${f}`))
          .sort()
          .map((f) => ({
            tag: 'link',
            attrs: {
              rel: 'preload',
              as: 'font',
              type: 'font/woff2',
              crossorigin: true,
              href: `/${f}`,
            },
            injectTo: 'head' as const,
          }));
      },
    },
  };
}

/**
 * dist/.vite/modules.json: the script file of every source module (by its path in the repo)
 * and the files each script imports. The server looks a direct load's page code and data
 * schemas up in it, to preload them with the page (apps/server/src/lib/index-page.ts).
 */
function moduleMap(): Plugin {
  return {
    name: 'turnstone-module-map',
    apply: 'build',
    generateBundle(_options, bundle) {
      const modules: Record<string, string> = {};
      const imports: Record<string, string[]> = {};
      for (const chunk of Object.values(bundle)) {
        if (chunk.type !== 'chunk') continue;
        imports[chunk.fileName] = chunk.imports;
        for (const id of chunk.moduleIds) {
          if (id.startsWith(here) && !id.includes('/node_modules/'))
            modules[id.slice(here.length)] = chunk.fileName;
        }
      }
      this.emitFile({
        type: 'asset',
        fileName: '.vite/modules.json',
        source: JSON.stringify({ modules, imports }),
      });
    },
  };
}

/**
 * Every built script, stylesheet and icon of 1 kB or more is written compressed beside
 * itself (`.br` at brotli's strongest level, `.gz` at gzip's), once, at build time: the server
 * sends those (apps/server/src/lib/precompressed-assets.ts) instead of compressing each
 * request's copy again.
 */
function precompress(): Plugin {
  return {
    name: 'turnstone-precompress',
    apply: 'build',
    async writeBundle(options, bundle) {
      const dir = options.dir;
      if (!dir) return;
      const files = Object.keys(bundle).filter((f) => /\.(js|css|svg)$/.test(f));
      await Promise.all(
        files.map(async (f) => {
          const data = await readFile(join(dir, f));
          if (data.length < 1024) return;
          const [br, gz] = await Promise.all([
            brotli(data, {
              params: {
                [zlib.BROTLI_PARAM_QUALITY]: zlib.BROTLI_MAX_QUALITY,
                [zlib.BROTLI_PARAM_SIZE_HINT]: data.length,
              },
            }),
            gzip(data, { level: 9 }),
          ]);
          await Promise.all([
            writeFile(join(dir, `${f}.br`), br),
            writeFile(join(dir, `${f}.gz`), gz),
          ]);
        }),
      );
    },
  };
}

// One config: the web app build (root apps/web, output apps/web/dist) and the test projects.
export default defineConfig({
  root: 'apps/web',
  plugins: [
    react(),
    tailwindcss(),
    preloadSignedInLayout(),
    preloadFonts(),
    moduleMap(),
    precompress(),
  ],
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    chunkSizeWarningLimit: 1200,
    // Every browser the app supports knows <link rel=modulepreload>; the polyfill would only
    // add its code to the main script.
    modulePreload: { polyfill: false },
    rolldownOptions: { output: { codeSplitting: { groups: vendorChunks } } },
  },
  // The browser's Host goes through to the API (changeOrigin off), so its same-origin and
  // host checks accept sign-in through the proxy (npm run dev: apps/server/src/dev-vite.ts).
  server: {
    host: '127.0.0.1',
    port: 5173,
    proxy: { '/api': { target: apiTarget, changeOrigin: false } },
  },
  test: {
    root: here,
    projects: [
      {
        test: {
          name: 'unit',
          root: here,
          include: [
            'packages/**/src/**/*.test.ts',
            'apps/**/src/**/*.test.ts',
            'tests/reference/**/*.test.ts',
            'tests/property/**/*.test.ts',
            'tests/structure/**/*.test.ts',
          ],
        },
      },
      {
        // The same signal-processing checks on the fft.js path (runtimes without WebAssembly
        // SIMD), so both FFT paths stay proven against the same references.
        test: {
          name: 'unit-fft-js',
          root: here,
          include: ['packages/dsp/src/**/*.test.ts', 'tests/reference/scipy-spectra.test.ts'],
          // The kernel's own tests: TURNSTONE_FFT=js switches the kernel off, so there they
          // would test nothing (the project `unit` runs them).
          exclude: ['packages/dsp/src/fft-kernel.test.ts'],
          env: { TURNSTONE_FFT: 'js' },
        },
      },
      {
        test: {
          name: 'api',
          root: here,
          include: ['tests/api/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'faults',
          root: here,
          include: ['tests/faults/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 300_000,
          hookTimeout: 120_000,
        },
      },
      {
        test: {
          name: 'browser',
          root: here,
          include: ['tests/browser/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
});
