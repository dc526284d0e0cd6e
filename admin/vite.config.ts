import { fileURLToPath } from 'node:url';
import tailwindcss from '@tailwindcss/vite';
import react from '@vitejs/plugin-react';
import { defineConfig } from 'vite';

const port = Number(process.env.ADMIN_PORT ?? 5174);
const apiProxy = {
  '/api': {
    target: process.env.EVENHAND_API_ORIGIN ?? 'http://127.0.0.1:3100',
    changeOrigin: false,
  },
};

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: {
    alias: { '@': fileURLToPath(new URL('./src', import.meta.url)) },
    // The contract's schemas import zod; one copy of it in the bundle, shared with the app's own forms.
    dedupe: ['zod'],
  },
  server: { host: '127.0.0.1', port, strictPort: true, proxy: apiProxy },
  preview: { host: '127.0.0.1', port, strictPort: true, proxy: apiProxy },
});
