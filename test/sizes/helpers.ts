// Shared by the size-distribution tests: an independent numerical moment to check the closed forms against.
import { dNdlnD, type LognormalMode } from '../../src-core/index.ts'

/** Trapezoid rule for ∫ D^k dN/dlnD dlnD over ln D from a to b, with n steps. */
export function trapezoidMoment(mode: LognormalMode, k: number, a: number, b: number, n: number): number {
  const h = (b - a) / n
  let s = 0
  for (let i = 0; i <= n; i++) {
    const u = a + i * h
    const f = Math.exp(k * u) * dNdlnD(mode, Math.exp(u))
    s += i === 0 || i === n ? f / 2 : f
  }
  return s * h
}
