// The computing worker: all physics runs here, through src-core's public API only.
import {
  binsFromMeasurement,
  binValues,
  dNdlogD,
  evaluateStudy,
  getMaterial,
  modeFromMass,
  modeFromNumber,
  modeFromVolume,
  type LognormalMode,
  type Sample,
  type UserMaterialSpec
} from '../../src-core/index.ts'
import type { SizeCurves } from '../state/store.ts'
import type { FromWorker, ToWorker } from './messages.ts'

const post = (m: FromWorker): void => (self as unknown as Worker).postMessage(m)

function message(e: unknown): string {
  return e instanceof Error ? e.message : String(e)
}

/** The dry density a mass-given mode uses: the composition's own, else the volume-weighted component densities. */
function density(sample: Sample, users: UserMaterialSpec[], comp = sample.composition): number {
  if (comp.density_g_cm3) return comp.density_g_cm3
  let rho = 0
  for (const c of comp.components) {
    const user = users.find((u) => u.id === c.material)
    rho += c.volume_fraction * (user ? user.density_g_cm3 : getMaterial(c.material).densityGcm3)
  }
  return rho
}

function sizeCurves(sample: Sample, users: UserMaterialSpec[]): SizeCurves {
  const diameter_um: number[] = []
  const number: number[] = []
  if (sample.size.kind === 'modes') {
    const modes: LognormalMode[] = sample.size.modes.map((m) =>
      m.by === 'number'
        ? modeFromNumber({ number: m.number_cm3, median: m.median_um, gsd: m.gsd })
        : m.by === 'volume'
          ? modeFromVolume({ volume: m.volume_um3_cm3, volumeMedian: m.median_um, gsd: m.gsd })
          : modeFromMass({ mass: m.mass_ug_m3, massMedian: m.median_um, gsd: m.gsd, density: density(sample, users, m.composition ?? sample.composition) })
    )
    const steps = 240
    for (let i = 0; i <= steps; i++) {
      const d = 10 ** (-3 + (5 * i) / steps)
      diameter_um.push(d)
      number.push(modes.reduce((sum, m) => sum + dNdlogD(m, d), 0))
    }
  } else {
    const b = sample.size.bins
    const bins = binsFromMeasurement({
      diameters: b.diameters,
      diameterKind: b.edges ? 'edges' : 'midpoints',
      diameterUnit: b.diameter_unit,
      quantity: b.quantity,
      values: b.values,
      density: b.quantity === 'dM/dlogDp' ? density(sample, users) : undefined
    })
    // Steps: each bin's value from its left edge; the last value repeated at the last edge.
    const n = bins.dNdlogD.length
    const S = binValues(bins, 'dS/dlogDp')
    const V = binValues(bins, 'dV/dlogDp')
    const at = (a: ArrayLike<number>) => [...Array.from(a), a[n - 1]]
    return { diameter_um: Array.from(bins.edges), number: at(bins.dNdlogD), surface: at(S), volume: at(V), measured: true }
  }
  // Surface and volume per log D of spheres: πD² and (π/6)D³ times dN/dlogD.
  const surface = number.map((n, i) => Math.PI * diameter_um[i] ** 2 * n)
  const volume = number.map((n, i) => (Math.PI / 6) * diameter_um[i] ** 3 * n)
  return { diameter_um, number, surface, volume, measured: false }
}

self.onmessage = (e: MessageEvent<ToWorker>) => {
  const m = e.data
  if (m.type === 'sizes') {
    for (const item of m.items) {
      try {
        post({ type: 'sizes', job: m.job, id: item.id, curves: sizeCurves(item.sample, item.userMaterials) })
      } catch (err) {
        post({ type: 'sizes', job: m.job, id: item.id, error: message(err) })
      }
    }
    return
  }
  const total = m.items.length
  post({ type: 'progress', job: m.job, done: 0, total })
  m.items.forEach((item, i) => {
    try {
      const r = evaluateStudy(item.study)
      post({ type: 'result', job: m.job, id: item.id, key: item.key, result: r.samples[0] })
    } catch (err) {
      post({ type: 'failed', job: m.job, id: item.id, key: item.key, message: message(err) })
    }
    post({ type: 'progress', job: m.job, done: i + 1, total })
  })
  post({ type: 'finished', job: m.job })
}
