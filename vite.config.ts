/// <reference types="vitest/config" />
import { defineConfig } from 'vite';
import { configDefaults } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { fileURLToPath } from 'node:url';

const at = (path: string) => fileURLToPath(new URL(path, import.meta.url));

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: {
    alias: {
      '@shared': at('./shared'),
      '@': at('./src'),
    },
  },
  server: {
    port: 5870,
    proxy: { '/api': 'http://127.0.0.1:4870' },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    chunkSizeWarningLimit: 1500,
    rollupOptions: {
      // Some dependencies carry tree-shaking hints Rollup cannot place; harmless, and noisy.
      onwarn(warning, warn) {
        if (warning.code !== 'INVALID_ANNOTATION') warn(warning);
      },
    },
  },
  test: {
    include: ['shared/**/*.test.ts', 'server/**/*.test.ts', 'db/**/*.test.ts', 'src/**/*.test.ts', 'tests/**/*.test.ts'],
    // The slow fault tests have their own run: npm run test:faults (vitest.faults.config.ts).
    exclude: [...configDefaults.exclude, 'tests/faults/**'],
    // API and browser tests share one PostgreSQL database: run files one after another.
    fileParallelism: false,
    testTimeout: 30_000,
    hookTimeout: 120_000,
    setupFiles: ['tests/setup/env.ts'],
  },
});
