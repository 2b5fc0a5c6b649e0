// Figures of a binned distribution (number flat in log D inside each bin, BIN_SHAPE) and the same figures of
// lognormal modes, worked out independently: the lognormal CDF through erfc and the Hatch–Choate relations
// (Hinds, Aerosol Technology ch. 4, from memory): the volume distribution of a mode is lognormal with the same σg
// and median CMD·exp(3 ln²σg); its total volume is N (π/6) CMD³ exp(4.5 ln²σg).
import { erfc } from '../../src-core/index.ts'
import type { Mode } from './synthetic.ts'

export interface Figures {
  number: number
  volume: number
  numberMedianUm: number
  volumeMedianUm: number
  numberGsd: number
  volumeGsd: number
}

/** Figures of bins (edges µm, dN/dlogD cm⁻³); each bin is cut into 64 pieces in ln D for the volume moments. */
export function binFigures(edges: ArrayLike<number>, dNdlogD: ArrayLike<number>): Figures {
  const pieces: { lnD: number; dlnD: number; n: number; v: number }[] = []
  for (let k = 0; k < dNdlogD.length; k++) {
    const a = Math.log(edges[k])
    const b = Math.log(edges[k + 1])
    const h = (b - a) / 64
    for (let p = 0; p < 64; p++) {
      const lo = Math.exp(a + p * h)
      const hi = Math.exp(a + (p + 1) * h)
      const n = (dNdlogD[k] * h) / Math.LN10
      // exact volume of the piece under a flat dN/dlnD: (π/6) dN/dlnD (hi³ − lo³)/3
      const v = ((Math.PI / 6) * (dNdlogD[k] / Math.LN10) * (hi ** 3 - lo ** 3)) / 3
      pieces.push({ lnD: a + (p + 0.5) * h, dlnD: h, n, v })
    }
  }
  const moments = (w: (p: (typeof pieces)[0]) => number) => {
    const total = pieces.reduce((s, p) => s + w(p), 0)
    const mean = pieces.reduce((s, p) => s + w(p) * p.lnD, 0) / total
    const variance = pieces.reduce((s, p) => s + w(p) * ((p.lnD - mean) ** 2 + (p.dlnD * p.dlnD) / 12), 0) / total
    let acc = 0
    let median = NaN
    for (const p of pieces) {
      const next = acc + w(p)
      if (next >= total / 2) {
        median = Math.exp(p.lnD - p.dlnD / 2 + (p.dlnD * (total / 2 - acc)) / w(p))
        break
      }
      acc = next
    }
    return { total, median, gsd: Math.exp(Math.sqrt(variance)) }
  }
  const n = moments((p) => p.n)
  const v = moments((p) => p.v)
  return { number: n.total, volume: v.total, numberMedianUm: n.median, volumeMedianUm: v.median, numberGsd: n.gsd, volumeGsd: v.gsd }
}

/** The same figures of lognormal modes, exactly (the medians by bisection on the mixture's CDF). */
export function modeFigures(modes: readonly Mode[]): Figures {
  const parts = (weight: 'n' | 'v') =>
    modes.map((m) => {
      const s = Math.log(m.gsd)
      const median = weight === 'n' ? m.cmdUm : m.cmdUm * Math.exp(3 * s * s)
      const total = weight === 'n' ? m.n : ((m.n * Math.PI) / 6) * m.cmdUm ** 3 * Math.exp(4.5 * s * s)
      return { mu: Math.log(median), s, total }
    })
  const figures = (ps: ReturnType<typeof parts>) => {
    const total = ps.reduce((a, p) => a + p.total, 0)
    const mean = ps.reduce((a, p) => a + p.total * p.mu, 0) / total
    const second = ps.reduce((a, p) => a + p.total * (p.s * p.s + p.mu * p.mu), 0) / total
    const below = (x: number) => ps.reduce((a, p) => a + 0.5 * p.total * erfc(-(x - p.mu) / (Math.SQRT2 * p.s)), 0) / total
    let lo = Math.log(1e-4)
    let hi = Math.log(1e3)
    for (let i = 0; i < 200; i++) {
      const mid = (lo + hi) / 2
      if (below(mid) < 0.5) lo = mid
      else hi = mid
    }
    return { total, median: Math.exp((lo + hi) / 2), gsd: Math.exp(Math.sqrt(second - mean * mean)) }
  }
  const n = figures(parts('n'))
  const v = figures(parts('v'))
  return { number: n.total, volume: v.total, numberMedianUm: n.median, volumeMedianUm: v.median, numberGsd: n.gsd, volumeGsd: v.gsd }
}

/** Relative differences of every figure. */
export function relativeErrors(got: Figures, want: Figures): Record<keyof Figures, number> {
  const out = {} as Record<keyof Figures, number>
  for (const k of Object.keys(want) as (keyof Figures)[]) out[k] = Math.abs(got[k] / want[k] - 1)
  return out
}
