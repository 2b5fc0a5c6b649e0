// `npm start`: the desktop app where the Electron runtime is installed; otherwise the same app served locally.
import { spawn } from 'node:child_process'
import { createRequire } from 'node:module'

const require = createRequire(import.meta.url)

function electronPath() {
  try {
    return require('electron')
  } catch {
    return null
  }
}

const script = (path) => new URL(`../node_modules/${path}`, import.meta.url).pathname
const run = (args) => {
  const child = spawn(process.execPath, args, { stdio: 'inherit' })
  child.on('exit', (code) => process.exit(code ?? 0))
}

if (electronPath()) {
  run([script('electron-vite/bin/electron-vite.js'), 'dev'])
} else {
  console.log('The Electron runtime is not installed here; serving the same app in your browser instead.')
  run([script('vite/bin/vite.js'), '--config', 'vite.web.config.ts'])
}
