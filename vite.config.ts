import { fileURLToPath } from 'node:url';
import tailwindcss from '@tailwindcss/vite';
import react from '@vitejs/plugin-react';
import { defineConfig } from 'vite';

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  server: {
    proxy: { '/api': 'http://localhost:3000' },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    rolldownOptions: {
      output: {
        // three.js loads only with a 3D screen, in two chunks of its own (each under the size
        // warning); React Three Fiber and its helpers stay in the 3D screens' own chunk
        codeSplitting: {
          groups: [
            {
              name: 'three-core',
              test: /[\\/]node_modules[\\/]three[\\/]build[\\/]three\.core/,
              priority: 2,
            },
            { name: 'three', test: /[\\/]node_modules[\\/]three[\\/]/, priority: 1 },
          ],
        },
      },
    },
  },
});
