// Before the tests: build the command line (scripts/build-cli.mjs, about a second), so the tests that run
// `node bin/motebench.mjs` exercise the current source, as a user's `npm install` would build it. The commands
// the tests run keep their files between runs (the bins' kernels of `series`: src-main/cli/kernel-cache.ts) in a
// folder of this test run's, removed at its end, not in the user's cache folder.
import { execFileSync } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'

export default function setup(): () => void {
  execFileSync(process.execPath, [fileURLToPath(new URL('../scripts/build-cli.mjs', import.meta.url))], { stdio: ['ignore', 'ignore', 'inherit'] })
  const cache = mkdtempSync(join(tmpdir(), 'motebench-test-cache-'))
  process.env.MOTEBENCH_CACHE_DIR = cache
  return () => rmSync(cache, { recursive: true, force: true })
}
