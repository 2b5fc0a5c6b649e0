/**
 * Where user components' expressions get their compiler (mathjs with all its functions: over half a megabyte of
 * code, most of an optics worker's script). index.ts installs it when it loads, so the CLI, the page and the tests
 * have it; a thread that imports compute.ts alone (the app's optics workers) starts without it and loads it with
 * loadExpressionCompiler() only for a study that has expression components.
 */
import type { EvalFunction } from 'mathjs'

type Compile = (text: string) => EvalFunction

let compiler: Compile | null = null

/** Makes `compile` the compiler of expressions (index.ts installs mathjs's). */
export function installExpressionCompiler(compile: Compile): void {
  compiler = compile
}

/** Loads and installs the expression compiler if it is not there yet. */
export async function loadExpressionCompiler(): Promise<void> {
  if (!compiler) installExpressionCompiler((await import('./mathjsExpressions.ts')).mathCompile)
}

/** True when a study's user components include expressions, which need the compiler (loadExpressionCompiler). */
export function needsExpressionCompiler(study: { readonly user_materials?: ReadonlyArray<{ readonly index: { readonly kind: string } }> }): boolean {
  return (study.user_materials ?? []).some((u) => u.index.kind === 'expression')
}

/** Compiles an expression; a programming error where no compiler was installed or loaded. */
export function compileExpressionText(text: string): EvalFunction {
  if (!compiler) throw new Error('no expression compiler: await loadExpressionCompiler() before building a study with expression components from compute.ts')
  return compiler(text)
}
