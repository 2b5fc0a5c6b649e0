/**
 * mathjsExpressions.ts for bundles that must not carry mathjs when they start: the app's optics workers, whose
 * script is about 150 KB with it left out against 800 KB with it (the bundler puts this module in its place:
 * `expressionsOnDemand` in vite.shared.ts). mathCompile works once loadExpressionCompiler() has loaded mathjs, which
 * a worker awaits only for a study with components given by expressions (`needsExpressionCompiler`).
 */
import type { EvalFunction, MathJsInstance } from 'mathjs'

let expressions: MathJsInstance | undefined

/** mathjs's compile(text); a programming error before loadExpressionCompiler() has been awaited. */
export function mathCompile(text: string): EvalFunction {
  if (!expressions) throw new Error('expressions need mathjs loaded first: await loadExpressionCompiler() before reading a study with components given by expressions')
  return expressions.compile(text)
}

/** Loads mathjs (once). */
export async function loadExpressionCompiler(): Promise<void> {
  if (expressions) return
  const { all, create } = await import('mathjs')
  expressions ??= create(all)
}
