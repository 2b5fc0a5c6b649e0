/**
 * Whether a study needs the compiler of user components' expressions, and loading it where a bundle leaves it out
 * (the app's optics workers: see mathjsExpressionsOnDemand.ts). Everywhere else it is part of the bundle and
 * loadExpressionCompiler does nothing.
 */
export { loadExpressionCompiler } from './mathjsExpressions.ts'

/** True when a study's user components include expressions (which need the compiler: loadExpressionCompiler). */
export function needsExpressionCompiler(study: { readonly user_materials?: ReadonlyArray<{ readonly index: { readonly kind: string } }> }): boolean {
  return (study.user_materials ?? []).some((u) => u.index.kind === 'expression')
}
