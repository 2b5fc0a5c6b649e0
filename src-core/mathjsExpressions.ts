/**
 * mathjs's expression compiler, made on first use with every mathjs function (an expression may call any of
 * them). In its own module so that only what reads expressions (user materials) loads all of mathjs.
 *
 * The app's optics workers are built with mathjsExpressionsOnDemand.ts in its place (over half a megabyte less
 * to load when they start: see expressionCompiler.ts); `loadExpressionCompiler` is for them, and does nothing here.
 */
import type { EvalFunction, MathJsInstance } from 'mathjs'
import { makeAll } from './mathjsAll.ts'

let expressions: MathJsInstance | undefined

/** mathjs's compile(text): an expression evaluated later with a scope. */
export function mathCompile(text: string): EvalFunction {
  return (expressions ??= makeAll()).compile(text)
}

/** Makes mathCompile ready (here it always is). */
export async function loadExpressionCompiler(): Promise<void> {}
