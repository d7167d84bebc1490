import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';

// The API runs as its own process in development; Vite forwards /api and the server's local dev pages (/dev/mail) to it; '/dev/' so a client path like /devices is not caught.
const apiTarget = `http://127.0.0.1:${process.env.API_PORT ?? '3000'}`;

export default defineConfig({
  plugins: [react()],
  server: {
    port: 5173,
    strictPort: true,
    proxy: {
      '/api': { target: apiTarget, changeOrigin: false },
      '/dev/': { target: apiTarget, changeOrigin: false },
    },
  },
  preview: {
    port: 4173,
    proxy: {
      '/api': { target: apiTarget, changeOrigin: false },
      '/dev/': { target: apiTarget, changeOrigin: false },
    },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    sourcemap: true,
  },
});
