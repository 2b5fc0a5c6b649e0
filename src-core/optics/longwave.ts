/**
 * A sample's thermal-infrared optics in the longwave bands (climate/longwaveBands.ts): Mie on the same size
 * distribution, with the water it takes up at its humidity, at each band's node wavelengths, averaged over the
 * band (bandAverage). Only σext, σsca, σabs and g: no angular sums. The size integration runs over all the node
 * wavelengths at once on shared nodes (spectralIntegrate.ts): the particles are small against these wavelengths,
 * so its set-up and each node's water uptake, computed once for all of them, would otherwise cost more than the
 * Mie series.
 */
import { bandAverage, blackbodyFractionBelow, LONGWAVE_BANDS, LONGWAVE_WEIGHT_TEMPERATURE_K, longwaveNodeWavelengthsUm } from '../climate/index.ts'
import { InputError } from '../errors.ts'
import type { Material } from '../materials/index.ts'
import type { Sample, Study } from '../study/model.ts'
import { OpticsWorkspace } from './workspace.ts'
import { sampleSetting, studyMaterials } from './sample.ts'
import { spectralBulkSteps, type SpectralBulk } from './spectralIntegrate.ts'
import type { LongwaveBandOptics, LongwaveOptics } from './types.ts'

/**
 * Relative accuracy of the infrared size integration: a band's optics stand for the band through a few nodes,
 * whose own error is far larger than this.
 */
export const LONGWAVE_TOLERANCE = 1e-3

/**
 * The coarsest lattice step of the infrared size integration (as IntegrationOptions.coarsestStep): the particles are
 * small against these wavelengths and the integrands smooth, so a coarser first grid settles with fewer Mie
 * evaluations (test/optics/spectral.test.ts checks the result against a one-wavelength integration at 1e-7).
 */
export const LONGWAVE_COARSEST_STEP = 2

/** The nodes' wavelengths, nm, in band order. */
export const LONGWAVE_NODES_NM: readonly number[] = Object.freeze(longwaveNodeWavelengthsUm().map((w) => Math.round(w * 1000)))
const LONGWAVE_NODES_UM: readonly number[] = Object.freeze(LONGWAVE_NODES_NM.map((w) => w / 1000))

function weight(lo: number, hi: number): number {
  const t = LONGWAVE_WEIGHT_TEMPERATURE_K
  return blackbodyFractionBelow(hi, t) - blackbodyFractionBelow(lo, t)
}

/**
 * The sample's optics in each longwave band, pausing every few milliseconds of work. Where a component of the
 * sample has no index over the thermal infrared (a study's own component tabulated over shorter wavelengths
 * only), the bands are empty and `withheld` says why: nothing is extrapolated.
 */
export function* sampleLongwaveSteps(
  sample: Sample,
  study: Pick<Study, 'user_materials' | 'wavelengths_nm'>,
  options: { workspace?: OpticsWorkspace; tolerance?: number; coarsestStep?: number } = {}
): Generator<void, LongwaveOptics> {
  const atNodes = { user_materials: study.user_materials, wavelengths_nm: [...LONGWAVE_NODES_NM] }
  let own: Material[]
  let bulk: SpectralBulk
  try {
    own = studyMaterials(atNodes)
    const tolerance = Math.max(options.tolerance ?? 0, LONGWAVE_TOLERANCE)
    const { pops, cond } = sampleSetting(sample, atNodes, { tolerance }, own)
    const coarsestStep = Math.max(options.coarsestStep ?? 1, LONGWAVE_COARSEST_STEP)
    bulk = yield* spectralBulkSteps(pops, LONGWAVE_NODES_UM, cond, { tolerance, coarsestStep }, options.workspace ?? new OpticsWorkspace())
  } catch (e) {
    if (e instanceof InputError) return { bands: [], withheld: `The infrared part is left out: ${e.message}` }
    throw e
  }
  const bands: LongwaveBandOptics[] = []
  let k = 0
  for (const b of LONGWAVE_BANDS) {
    const nodes = b.nodesUm.map(() => {
      const r = k++
      return { ext: bulk.ext[r], sca: bulk.sca[r], g: bulk.g[r] }
    })
    const avg = bandAverage(b, nodes, weight)
    bands.push({ lo_um: b.loUm, hi_um: b.hiUm, ext: avg.ext, sca: avg.sca, abs: avg.ext - avg.sca, ssa: avg.ext > 0 ? avg.sca / avg.ext : 0, g: avg.g })
  }
  return { bands, withheld: null }
}
