/**
 * The mathjs instance with every function, for user expressions (mathjsExpressions.ts makes it on first use). In a
 * module of its own so that the command line's build can load mathjs only when an expression is first compiled
 * (scripts/build-cli.mjs bundles this module apart and loads it on first call).
 */
import { all, create, type MathJsInstance } from 'mathjs'

export function makeAll(): MathJsInstance {
  return create(all)
}
