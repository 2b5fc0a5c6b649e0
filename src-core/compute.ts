/**
 * The computation without the document: a public entry beside index.ts for threads that only compute (the
 * app's optics workers). It leaves out reading and checking documents (the study's schema, the field readers,
 * the tools), so that such a worker does not load them when it starts.
 */
export * from './optics/index.ts'
export type * from './study/model.ts'
// a bundle built without the expression compiler (mathjsExpressionsOnDemand.ts) awaits loadExpressionCompiler() for a study with expression components
export { loadExpressionCompiler, needsExpressionCompiler } from './expressionCompiler.ts'
