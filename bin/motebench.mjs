#!/usr/bin/env node
// The motebench command: runs the command line built to JavaScript in out/cli (built by `npm install` / `npm ci`,
// or `npm run build:cli`), so no TypeScript is compiled when a command runs.
import { existsSync } from 'node:fs'

const main = new URL('../out/cli/main.mjs', import.meta.url)
if (!existsSync(main)) {
  process.stderr.write(`motebench: the command line is not built; run "npm run build:cli" (or "npm install") in ${new URL('..', import.meta.url).pathname}\n`)
  process.exit(2)
}
await import(main.href)
