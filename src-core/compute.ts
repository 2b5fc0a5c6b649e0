/**
 * The computation without the document: a public entry beside index.ts for threads that only compute (the
 * app's optics workers). It leaves out reading and checking documents (the study's schema, the field readers,
 * the tools), so that such a worker does not load them when it starts.
 */
export * from './optics/index.ts'
export type * from './study/model.ts'
// without the expression compiler: a study with expression components needs `await loadExpressionCompiler()` first
export { loadExpressionCompiler, needsExpressionCompiler } from './expressionCompiler.ts'
