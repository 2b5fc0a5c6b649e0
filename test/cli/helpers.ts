// Running motebench commands in tests: as a user would (node bin/motebench.mjs, a child process), or in this
// process through the same runGuarded wrapper the CLI uses (faster; same exit codes and messages).
import { execFile } from 'node:child_process'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { runGuarded } from '../../src-main/cli/common.ts'

export const repo = fileURLToPath(new URL('../../', import.meta.url))
const bin = join(repo, 'bin/motebench.mjs')

export interface Ran {
  code: number
  stdout: string
  stderr: string
}

/** The real CLI in a child process. */
export function run(args: string[], cwd = repo): Promise<Ran> {
  return new Promise((resolve) => {
    execFile(process.execPath, [bin, ...args], { cwd, timeout: 120_000, maxBuffer: 64 << 20 }, (err, stdout, stderr) => {
      resolve({ code: err ? ((err as { code?: number }).code ?? 1) : 0, stdout, stderr })
    })
  })
}

/** A command function run in this process, its standard output and error captured. */
export async function runHere(command: (argv: string[]) => number | Promise<number>, args: string[]): Promise<Ran> {
  let stdout = ''
  let stderr = ''
  const out = process.stdout.write
  const err = process.stderr.write
  process.stdout.write = ((chunk: string | Uint8Array) => ((stdout += String(chunk)), true)) as typeof process.stdout.write
  process.stderr.write = ((chunk: string | Uint8Array) => ((stderr += String(chunk)), true)) as typeof process.stderr.write
  try {
    const code = await runGuarded(() => command(args))
    return { code, stdout, stderr }
  } finally {
    process.stdout.write = out
    process.stderr.write = err
  }
}

/** One line on standard error, no stack trace. */
export function expectOneLine(stderr: string): void {
  const lines = stderr.trimEnd().split('\n')
  if (lines.length !== 1) throw new Error(`expected one line on stderr, got ${lines.length}:\n${stderr}`)
  if (/\n\s+at .*:\d+|\.ts:\d+:\d+/.test(stderr)) throw new Error(`stack trace on stderr:\n${stderr}`)
}
