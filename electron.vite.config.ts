// Electron build: main process, preload and renderer bundles (`npm run build`).
import { defineConfig } from 'electron-vite'
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { expressionsOnDemand } from './vite.shared.ts'

const version = (JSON.parse(readFileSync(resolve(import.meta.dirname, 'package.json'), 'utf8')) as { version: string }).version

export default defineConfig({
  main: {
    build: {
      outDir: 'out/main',
      rollupOptions: { input: { index: resolve(import.meta.dirname, 'src-main/main.ts') } }
    }
  },
  preload: {
    build: {
      outDir: 'out/preload',
      // a sandboxed preload must be CommonJS
      rollupOptions: {
        input: { index: resolve(import.meta.dirname, 'src-main/preload.ts') },
        output: { format: 'cjs', entryFileNames: '[name].cjs' }
      }
    }
  },
  renderer: {
    root: resolve(import.meta.dirname, 'src-renderer'),
    define: { __APP_VERSION__: JSON.stringify(version) },
    esbuild: { jsx: 'automatic', jsxImportSource: 'preact' },
    worker: { format: 'es', plugins: () => [expressionsOnDemand()] },
    build: {
      outDir: 'out/renderer',
      chunkSizeWarningLimit: 2000,
      rollupOptions: { input: { index: resolve(import.meta.dirname, 'src-renderer/index.html') } }
    }
  }
})
