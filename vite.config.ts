import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { fileURLToPath } from 'node:url';

// `@/` is src/ and `@shared/` is shared/ (the same paths as tsconfig.app.json).
export const clientAliases = {
  '@/': fileURLToPath(new URL('./src/', import.meta.url)),
  '@shared/': fileURLToPath(new URL('./shared/', import.meta.url)),
};

const apiPort = process.env.QUARRY_API_PORT ?? '3001';

// The client is built into dist/ and served by Express; in `npm run dev`
// Vite serves it and proxies /api to the watched API server.
export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: { alias: clientAliases },
  build: { outDir: 'dist', emptyOutDir: true },
  server: {
    port: 5173,
    proxy: { '/api': { target: `http://localhost:${apiPort}`, changeOrigin: false } },
  },
});
