// Shared pieces of the command line: argument errors, output, exit codes.
import { parseArgs, type ParseArgsConfig } from 'node:util'
import { open, rename, unlink, type FileHandle } from 'node:fs/promises'
import { InputError, parseWavelengthList, type Sample, type Study } from '../../src-core/index.ts'
import { StudyFileError } from '../studyFileError.ts'
import { sevenDigits } from './number-text.ts'

/** A bad command-line argument: printed as one line, exit status 2. */
export class UsageError extends Error {}

export const EXIT_OK = 0
export const EXIT_SKIPPED = 1
export const EXIT_BAD_INPUT = 2

type Options = NonNullable<ParseArgsConfig['options']>

/** A value that starts with a minus sign and then a digit or a point: "-1", "-0.5", "-.5", "-2e3", "-120nm". */
const NEGATIVE_VALUE = /^-\.?\d/

/**
 * "--x -1" as "--x=-1": node:util parseArgs refuses a value that starts with a dash after a separate option
 * ("argument is ambiguous"), so a negative number typed with a space would never reach the option's own range
 * check. Joining it to a value-taking long option makes both spellings give the same message.
 */
export function joinNegativeValues(argv: string[], options: Options): string[] {
  const out: string[] = []
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]
    if (a === '--') {
      out.push(...argv.slice(i))
      break
    }
    const name = a.startsWith('--') && !a.includes('=') ? a.slice(2) : undefined
    const next = argv[i + 1]
    if (name !== undefined && options[name]?.type === 'string' && next !== undefined && NEGATIVE_VALUE.test(next)) {
      out.push(`${a}=${next}`)
      i++
    } else out.push(a)
  }
  return out
}

/** node:util parseArgs with our error wording; a negative value after a separate option is read as its value. */
export function readArgs<O extends Options>(command: string, argv: string[], options: O, allowPositionals = false) {
  try {
    return parseArgs({ args: joinNegativeValues(argv, options), options, allowPositionals, strict: true })
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

/**
 * Two values written A:B (a range LO:HI, a pair of angles), each read by `read` (a plain number by default): the
 * one reading of that form for every command, so each says the same when it is not two values.
 */
export function readPair<T = number>(text: string, where: { command: string; flag: string; form?: 'A:B' | 'LO:HI'; example: string }, read: (part: string, flag: string) => T = readNumber as (part: string, flag: string) => T): [T, T] {
  const parts = text.split(':')
  if (parts.length !== 2) throw new UsageError(`${where.command}: ${where.flag} "${text}" is not ${where.form ?? 'A:B'}, e.g. ${where.example}`)
  return [read(parts[0], where.flag), read(parts[1], where.flag)]
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
    if (e instanceof StudyFileError) {
      // every problem of the study, each with its place and fix
      const n = e.problems.length
      process.stderr.write(`motebench: ${e.path} is not a valid study: ${n} problem${n === 1 ? '' : 's'}\n`)
      for (const p of e.problems) process.stderr.write(`  ${p.path}: ${p.message}\n    fix: ${p.fix}\n`)
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

/** A list of wavelengths typed on the command line, in nm (src-core's reader: "450,550,700nm", "0.45um,0.55um"). */
export function readWavelengthsNm(text: string, flag = '--wavelengths'): number[] {
  return parseWavelengthList(text, flag, { distinct: true })
}

/** A whole number typed on the command line, from lo to hi. */
export function readInteger(text: string | undefined, flag: string, lo: number, hi: number, fallback: number): number {
  if (text === undefined) return fallback
  const v = Number(text)
  if (text.trim() === '' || !Number.isInteger(v) || v < lo || v > hi) throw new UsageError(`${flag}: "${text}" is not a whole number from ${lo} to ${hi}`)
  return v
}

/** A relative tolerance of the size integration: a number from 1e-8 to 0.1. */
export function readTolerance(text: string | undefined, fallback: number): number {
  const v = readNumber(text, '--tolerance', fallback)
  if (!(v >= 1e-8 && v <= 0.1)) throw new UsageError(`--tolerance: ${text} is outside 1e-8 to 0.1; give a relative accuracy such as 1e-3`)
  return v
}

/** One CSV cell: numbers as they are (7 significant digits), text quoted when it must be. */
export function csvCell(v: string | number | boolean | null | undefined): string {
  if (v === null || v === undefined) return ''
  if (typeof v === 'number') return Number.isFinite(v) ? sevenDigits(v) : ''
  const s = String(v)
  return /[",\r\n]/.test(s) || s !== s.trim() ? `"${s.replace(/"/g, '""')}"` : s
}

export function csvLine(cells: (string | number | boolean | null | undefined)[]): string {
  return cells.map(csvCell).join(',') + '\n'
}

/** The study's sample with this name (exact, else ignoring case), or a UsageError listing the names. */
export function findSample(study: Study, name: string, command: string): { sample: Sample; index: number } {
  let index = study.samples.findIndex((s) => s.name === name)
  if (index < 0) {
    const lower = name.toLowerCase()
    const matches = study.samples.map((s, i) => (s.name.toLowerCase() === lower ? i : -1)).filter((i) => i >= 0)
    if (matches.length === 1) index = matches[0]
  }
  if (index < 0) throw new UsageError(`${command}: the study has no sample "${name}"; its samples are: ${study.samples.map((s) => `"${s.name}"`).join(', ')}`)
  return { sample: study.samples[index], index }
}

// A reader that stops early (e.g. `motebench materials | head`) closes the pipe: end quietly, not with a stack trace.
process.stdout.on('error', (e: NodeJS.ErrnoException) => {
  if (e.code === 'EPIPE') process.exit(0)
  throw e
})

/**
 * A file written as a stream and seen only when complete: the text goes to FILE.tmp-PID, which `commit` renames
 * to FILE and `discard` (or Ctrl+C, a termination signal) removes, so no half-written output is ever left.
 */
export async function atomicFileOutput(path: string, command: string) {
  const tmp = `${path}.tmp-${process.pid}`
  let handle: FileHandle
  try {
    handle = await open(tmp, 'w')
  } catch (e) {
    throw new UsageError(`${command}: cannot write ${path}: ${(e as NodeJS.ErrnoException).code === 'ENOENT' ? 'its folder does not exist' : (e as Error).message}`)
  }
  let closed = false
  const close = async () => {
    if (!closed) {
      closed = true
      await handle.close()
    }
  }
  const onSignal = () => void unlink(tmp).finally(() => process.exit(130))
  process.once('SIGINT', onSignal)
  process.once('SIGTERM', onSignal)
  const detach = () => {
    process.off('SIGINT', onSignal)
    process.off('SIGTERM', onSignal)
  }
  return {
    write: async (text: string): Promise<void> => void (await handle.write(text)),
    async commit(): Promise<void> {
      await handle.sync()
      await close()
      await rename(tmp, path)
      detach()
    },
    async discard(): Promise<void> {
      await close().catch(() => {})
      await unlink(tmp).catch(() => {})
      detach()
    }
  }
}
