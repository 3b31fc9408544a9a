import { fileURLToPath } from 'node:url'
import vue from '@vitejs/plugin-vue'
import { defineConfig } from 'vite'

const apiPort = process.env.PORT ?? '3000'

// The dashboard lives in dashboard/; the API serves the build from dist/dashboard in production,
// and Vite proxies /api to it in development (`npm run dev:api` + `npm run dev:dashboard`).
export default defineConfig({
  root: fileURLToPath(new URL('./dashboard', import.meta.url)),
  plugins: [vue()],
  resolve: { alias: { '@shared': fileURLToPath(new URL('./shared', import.meta.url)) } },
  server: { port: 5173, host: '127.0.0.1', proxy: { '/api': `http://127.0.0.1:${apiPort}` } },
  build: {
    outDir: fileURLToPath(new URL('./dist/dashboard', import.meta.url)),
    emptyOutDir: true,
    // naive-ui is one vendor chunk (~1 MB min, ~260 kB gzip with the slider, tabs and the accessible tab/radio parts), cached across releases.
    chunkSizeWarningLimit: 1100,
    rolldownOptions: {
      output: {
        codeSplitting: {
          groups: [
            { name: 'naive-ui', test: /node_modules[\\/](naive-ui|vueuc|vooks|css-render|@css-render|seemly|treemate|date-fns|evtd|vdirs|lodash-es|@juggle)/ },
            { name: 'vue', test: /node_modules[\\/](@vue|vue|vue-router|pinia)[\\/]/ },
            { name: 'd3', test: /node_modules[\\/](d3|d3-[a-z-]+|internmap|delaunator|robust-predicates)[\\/]/ },
            { name: 'arrow', test: /node_modules[\\/](apache-arrow|flatbuffers|tslib|json-bignum)[\\/]/ },
            { name: 'zod', test: /node_modules[\\/]zod[\\/]/ },
          ],
        },
      },
    },
  },
})
