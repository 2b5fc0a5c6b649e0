// Builders shared by the optics tests: populations of one lognormal mode with a constant index.
import {
  defineUserMaterial,
  dNdlnD,
  integrationRange,
  modeFromNumber,
  resolveComposition,
  type LognormalMode,
  type Population
} from '../../src-core/index.ts'

export function constantIndexKind(n: number, k: number, density = 1, kappa = 0) {
  const m = defineUserMaterial({ id: 'test-index', densityGcm3: density, kappa, index: { kind: 'constant', n, k } }, [0.55])
  return resolveComposition({ components: [{ material: 'test-index', volume_fraction: 1 }], mixing: 'volume-average' }, [m], 'test')
}

/** One lognormal mode of N = 1 cm⁻³ (unless given) as a population over all but `tail` of its 6th moment. */
export function modePopulation(median: number, gsd: number, n: number, k: number, number = 1, tail = 1e-7): { pop: Population; mode: LognormalMode; lo: number; hi: number } {
  const mode = modeFromNumber({ number, median, gsd })
  const r = integrationRange([mode], { highestMoment: 3, tailFraction: tail })
  const r6 = integrationRange([mode], { highestMoment: 6, tailFraction: tail })
  const lo = Math.log(r.min)
  const hi = Math.log(Math.max(r.max, Math.min(r6.max, 2)))
  return { pop: { label: 'test mode', kind: constantIndexKind(n, k), segments: [{ lo, hi, flat: false, density: (u) => dNdlnD(mode, Math.exp(u)) }] }, mode, lo, hi }
}

export const DRY = { rhPercent: 0, history: 'rising' as const, temperatureK: 298.15 }
