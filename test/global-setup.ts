// Before the tests: build the command line (scripts/build-cli.mjs, about a second), so the tests that run
// `node bin/motebench.mjs` exercise the current source, as a user's `npm install` would build it.
import { execFileSync } from 'node:child_process'
import { fileURLToPath } from 'node:url'

export default function setup(): void {
  execFileSync(process.execPath, [fileURLToPath(new URL('../scripts/build-cli.mjs', import.meta.url))], { stdio: ['ignore', 'ignore', 'inherit'] })
}
