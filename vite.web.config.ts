// The renderer served as a plain web page (`npm run web`), with the browser implementation of the host API.
import { defineConfig } from 'vite'
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { expressionsOnDemand } from './vite.shared.ts'

const version = (JSON.parse(readFileSync(resolve(import.meta.dirname, 'package.json'), 'utf8')) as { version: string }).version

export default defineConfig({
  root: resolve(import.meta.dirname, 'src-renderer'),
  base: './',
  define: { __APP_VERSION__: JSON.stringify(version) },
  esbuild: { jsx: 'automatic', jsxImportSource: 'preact' },
  worker: { format: 'es', plugins: () => [expressionsOnDemand()] },
  server: { host: '127.0.0.1', port: 5217, strictPort: false },
  preview: { host: '127.0.0.1', port: 5217, strictPort: false },
  build: { outDir: resolve(import.meta.dirname, 'out/web'), emptyOutDir: true, chunkSizeWarningLimit: 2000 }
})
