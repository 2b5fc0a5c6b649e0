export { gaussLegendre, gaussLegendreOn } from './gauss.ts'
export type { QuadratureRule } from './gauss.ts'
export { solveIncreasing } from './bisect.ts'
export { lastAtOrBelow } from './search.ts'
