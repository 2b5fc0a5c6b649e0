// Electron build: main process, preload and renderer bundles (`npm run build`).
import { defineConfig } from 'electron-vite'
import { resolve } from 'node:path'

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
    esbuild: { jsx: 'automatic', jsxImportSource: 'preact' },
    worker: { format: 'es' },
    build: {
      outDir: 'out/renderer',
      rollupOptions: { input: { index: resolve(import.meta.dirname, 'src-renderer/index.html') } }
    }
  }
})
