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
        // the 3D libraries load only with a 3D screen, in pieces under the size warning: three's core,
        // the rest of three, and the React bindings and helpers
        codeSplitting: {
          // a group takes only what it names: React and the rest stay where the importers put them
          includeDependenciesRecursively: false,
          groups: [
            {
              name: 'three-core',
              test: /[\\/]node_modules[\\/]three[\\/]build[\\/]three\.core/,
              priority: 3,
            },
            { name: 'three', test: /[\\/]node_modules[\\/]three[\\/]/, priority: 2 },
            {
              name: 'three-react',
              test: /[\\/]node_modules[\\/](@react-three|three-stdlib|troika-|camera-controls|maath|meshline|@monogrid|stats-gl|three-mesh-bvh|suspend-react|its-fine|zustand)/,
              priority: 1,
            },
          ],
        },
      },
    },
  },
});
