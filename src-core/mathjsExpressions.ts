/**
 * mathjs's expression compiler, made on first use with every mathjs function (an expression may call any of
 * them). In its own module so that only what reads expressions (user materials) loads all of mathjs.
 */
import { all, create, type EvalFunction, type MathJsInstance } from 'mathjs'

let expressions: MathJsInstance | undefined

/** mathjs's compile(text): an expression evaluated later with a scope. */
export function mathCompile(text: string): EvalFunction {
  return (expressions ??= create(all)).compile(text)
}
