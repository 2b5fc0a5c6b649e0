import { readableBeside, readableNumber } from './numberText.ts'

/**
 * The one error type src-core throws for bad input. It says what is wrong, where, and how to fix it,
 * so the app, the CLI and the tests can show it to a person without a stack trace.
 */
export class InputError extends Error {
  /** Where the bad value sits: a parameter name, a JSON path, "file.csv line 12 column 3", ... */
  readonly where: string
  /** What to do about it, in plain words. */
  readonly fix: string

  constructor(where: string, problem: string, fix: string) {
    super(`${where}: ${problem}. ${fix}`)
    this.name = 'InputError'
    this.where = where
    this.fix = fix
  }
}

/** Throws an InputError unless lo <= value <= hi (and value is a finite number). */
export function requireInRange(where: string, value: number, lo: number, hi: number, unit = ''): void {
  if (!Number.isFinite(value) || value < lo || value > hi) {
    const u = unit ? ` ${unit}` : ''
    const [l, h] = [readableNumber(lo), readableNumber(hi)]
    throw new InputError(where, `${readableBeside(value, lo, hi)}${u} is outside the valid range ${l}${u} to ${h}${u}`, `Give a value from ${l} to ${h}${u}.`)
  }
}
