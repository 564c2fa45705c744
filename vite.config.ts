import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';

const alias = {
  '@': fileURLToPath(new URL('./src', import.meta.url)),
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
};

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: { alias },
  build: { outDir: 'dist/client', sourcemap: true, chunkSizeWarningLimit: 1500 },
  server: {
    port: 5173,
    proxy: {
      '/api': 'http://127.0.0.1:3000',
      '/tiles': 'http://127.0.0.1:3000',
    },
  },
  test: {
    projects: [
      {
        extends: true,
        oxc: { decorator: { legacy: true } },
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.{ts,tsx}'],
          environment: 'node',
        },
      },
      {
        extends: true,
        // TypeORM entities use legacy decorators (every column type is written out, so no metadata is needed).
        oxc: { decorator: { legacy: true } },
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          testTimeout: 20000,
          hookTimeout: 30000,
        },
      },
      {
        extends: true,
        oxc: { decorator: { legacy: true } },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/e2e/global-setup.ts'],
          environment: 'node',
          testTimeout: 120000,
          hookTimeout: 180000,
          fileParallelism: false,
        },
      },
      {
        extends: true,
        oxc: { decorator: { legacy: true } },
        test: {
          // Real server processes killed and restarted, a fuzzer over every route: one file at a time.
          name: 'reliability',
          include: ['tests/reliability/**/*.test.ts'],
          environment: 'node',
          testTimeout: 300000,
          hookTimeout: 180000,
          fileParallelism: false,
        },
      },
    ],
  },
});
