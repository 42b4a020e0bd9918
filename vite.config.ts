import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';

const serverPort = Number(process.env.KNEEPOINT_PORT ?? 8080);

// One file for the client build and the test projects. Test projects:
// - unit: pure code in shared/, simulator/ and server/ (no database)
// - client: React components in happy-dom
// - integration: the server against a real MariaDB started by tests/setup/mariadb.ts
// - e2e: a real Chromium against the built app (tests/e2e)
export default defineConfig({
  plugins: [react()],
  build: {
    outDir: 'dist/client',
    emptyOutDir: true,
    sourcemap: true,
    rollupOptions: {
      // The alarm service worker is an entry of its own at a fixed name on the site's root
      // (a worker's scope is its directory, and browsers keep registrations by URL).
      input: { main: 'index.html', 'alarm-sw': 'src/sw/alarm-sw.ts' },
      output: {
        entryFileNames: (chunk) => (chunk.name === 'alarm-sw' ? 'alarm-sw.js' : 'assets/[name]-[hash].js'),
        // Libraries change less often than the app: separate chunks cache better.
        manualChunks(id: string) {
          if (!id.includes('node_modules')) return undefined;
          if (id.includes('uplot')) return 'vendor-uplot';
          if (id.includes('zod')) return 'vendor-zod';
          if (/node_modules\/(react|react-dom|scheduler|react-router|react-router-dom)\//.test(id)) return 'vendor-react';
          return 'vendor';
        },
      },
    },
  },
  server: {
    host: '127.0.0.1',
    proxy: {
      '/api': `http://127.0.0.1:${serverPort}`,
      '/ws': { target: `ws://127.0.0.1:${serverPort}`, ws: true },
    },
  },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          environment: 'node',
          include: ['shared/**/*.test.ts', 'simulator/**/*.test.ts', 'server/**/*.test.ts', 'tests/lint/**/*.test.ts'],
        },
      },
      {
        extends: true,
        test: {
          name: 'client',
          environment: 'happy-dom',
          include: ['src/**/*.test.{ts,tsx}'],
          setupFiles: ['tests/setup/client.ts'],
        },
      },
      {
        extends: true,
        test: {
          name: 'integration',
          environment: 'node',
          include: ['tests/integration/**/*.test.ts'],
          globalSetup: ['tests/setup/mariadb-global.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/setup/mariadb-global.ts', 'tests/setup/e2e-client.ts'],
          fileParallelism: false,
          testTimeout: 90_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
});
