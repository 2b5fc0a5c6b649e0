// The renderer served as a plain web page (`npm run web`), with the browser implementation of the host API.
import { defineConfig } from 'vite'
import { resolve } from 'node:path'

export default defineConfig({
  root: resolve(import.meta.dirname, 'src-renderer'),
  base: './',
  esbuild: { jsx: 'automatic', jsxImportSource: 'preact' },
  worker: { format: 'es' },
  server: { host: '127.0.0.1', port: 5217, strictPort: false },
  preview: { host: '127.0.0.1', port: 5217, strictPort: false },
  build: { outDir: resolve(import.meta.dirname, 'out/web'), emptyOutDir: true }
})
