/**
 * Motebench core: the public API. The app, the CLI and the tests import from here only.
 * Data flows one way: study → sample → per-wavelength particle optics → bulk optics → metrics → forcing.
 */
export * from './errors.ts'
export * from './units.ts'
export * from './numberText.ts'
export * from './numeric/index.ts'
export * from './mie/index.ts'
export * from './materials/index.ts'
export * from './sizes/index.ts'
export * from './optics/index.ts'
export * from './climate/index.ts'
export * from './study/index.ts'
export * from './field/index.ts'
export * from './uncertainty/index.ts'
export * from './instruments/index.ts'
export * from './closure/index.ts'
export * from './field/index.ts'
export { loadExpressionCompiler, needsExpressionCompiler } from './expressionCompiler.ts'
