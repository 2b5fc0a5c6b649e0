export { gaussLegendre, gaussLegendreOn } from './gauss.ts'
export type { QuadratureRule } from './gauss.ts'
