/**
 * mathjs instances made on first use, each with only the functions it needs. Importing mathjs's ready-made
 * functions builds every one of them when the module loads (over a second on a field laptop), which every
 * command and the app's start paid even when nothing was typed with a unit; from the factories, a bundler keeps
 * only what is used, and the work is done when a unit is first read. Expressions (which may
 * call any mathjs function) have their own instance: see mathjsExpressions.ts.
 */
import type { MathJsInstance, Unit } from 'mathjs'
import { makeQuantities } from './mathjsQuantities.ts'

let quantities: MathJsInstance | undefined

const forQuantities = (): MathJsInstance => (quantities ??= makeQuantities())

/** mathjs's unit(text): a quantity with a unit ("120 nm"). */
export function mathUnit(text: string): Unit {
  return forQuantities().unit(text)
}

/** mathjs's unit(value, name): a number in a named unit. */
export function mathUnitOf(value: number, unitName: string): Unit {
  return forQuantities().unit(value, unitName)
}
