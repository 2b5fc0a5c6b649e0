// Shared pieces of the command line: argument errors, output, exit codes.
import { parseArgs, type ParseArgsConfig } from 'node:util'
import { InputError } from '../../src-core/index.ts'

/** A bad command-line argument: printed as one line, exit status 2. */
export class UsageError extends Error {}

export const EXIT_OK = 0
export const EXIT_SKIPPED = 1
export const EXIT_BAD_INPUT = 2

type Options = NonNullable<ParseArgsConfig['options']>

/** node:util parseArgs with our error wording. */
export function readArgs<O extends Options>(command: string, argv: string[], options: O, allowPositionals = false) {
  try {
    return parseArgs({ args: argv, options, allowPositionals, strict: true })
  } catch (e) {
    throw new UsageError(`${command}: ${(e as Error).message.split('\n')[0]} (see "motebench help ${command}")`)
  }
}

/** Required option value or a UsageError naming it. */
export function need<T>(value: T | undefined, command: string, flag: string, example: string): T {
  if (value === undefined) throw new UsageError(`${command}: ${flag} is required, for example ${example}`)
  return value
}

/** A number typed on the command line. */
export function readNumber(text: string | undefined, flag: string, fallback?: number): number {
  if (text === undefined) {
    if (fallback === undefined) throw new UsageError(`${flag} is required`)
    return fallback
  }
  const v = Number(text)
  if (text.trim() === '' || !Number.isFinite(v)) throw new UsageError(`${flag}: "${text}" is not a number`)
  return v
}

/** "start:step:end" or a comma list, in degrees. */
export function readAngles(text: string, flag = '--angles'): number[] {
  const parts = text.split(':')
  if (parts.length === 3) {
    const [a, s, b] = parts.map((p) => readNumber(p, flag))
    if (!(s > 0) || b < a) throw new UsageError(`${flag}: "${text}" needs start:step:end with step > 0 and end ≥ start`)
    const n = Math.floor((b - a) / s + 1e-9)
    if (n > 100000) throw new UsageError(`${flag}: "${text}" asks for more than 100000 angles`)
    const out: number[] = []
    for (let i = 0; i <= n; i++) out.push(a + i * s)
    return out
  }
  return text.split(',').map((p) => readNumber(p, flag))
}

/** Prints JSON or text to standard output. */
export function printJson(value: unknown): void {
  process.stdout.write(JSON.stringify(value, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v), 2) + '\n')
}

/** A plain aligned table for people. */
export function printTable(rows: (string | number)[][]): void {
  const cells = rows.map((r) => r.map((c) => (typeof c === 'number' ? formatNumber(c) : c)))
  const widths = cells[0].map((_, j) => Math.max(...cells.map((r) => (r[j] ?? '').length)))
  for (const r of cells) process.stdout.write(r.map((c, j) => c.padEnd(widths[j])).join('  ').trimEnd() + '\n')
}

export function formatNumber(v: number): string {
  if (!Number.isFinite(v)) return String(v)
  if (v === 0) return '0'
  const a = Math.abs(v)
  return a >= 1e-3 && a < 1e6 ? Number(v.toPrecision(7)).toString() : v.toExponential(6)
}

/** Runs a command; bad input becomes one line on standard error and exit status 2, never a stack trace. */
export async function runGuarded(body: () => Promise<number> | number): Promise<number> {
  try {
    return await body()
  } catch (e) {
    if (e instanceof UsageError || e instanceof InputError) {
      process.stderr.write(`motebench: ${e.message}\n`)
      return EXIT_BAD_INPUT
    }
    const err = e as NodeJS.ErrnoException
    if (err && typeof err.code === 'string' && err.path) {
      process.stderr.write(`motebench: cannot use ${err.path}: ${err.code === 'ENOENT' ? 'no such file' : err.message}\n`)
      return EXIT_BAD_INPUT
    }
    process.stderr.write(`motebench: internal error: ${(e as Error)?.message ?? String(e)} (please report it with the command you ran)\n`)
    return 3
  }
}
