/**
 * A sample's bulk optics at the study's wavelengths: its populations (one per lognormal mode, or the
 * measured bins), integrated by `bulkOpticsAt`, and the figures derived from them.
 */
import { InputError } from '../errors.ts'
import { defineUserMaterial, type Material } from '../materials/index.ts'
import {
  BIN_SHAPE,
  binNumberConcentration,
  binSurfaceConcentration,
  binVolumeConcentration,
  binsFromMeasurement,
  dNdlnDOfLnD,
  integrationRange,
  modeFromMass,
  modeFromNumber,
  modeFromVolume,
  numberConcentration,
  particulateMatter,
  surfaceConcentration,
  volumeConcentration,
  particulateMatterBins,
  type LognormalMode,
  type SizeBins
} from '../sizes/index.ts'
import type { Composition, ModeSpec, Sample, Study } from '../study/model.ts'
import { UPSCATTER_COS_ZENITH } from './upscatter.ts'
import { bulkOpticsSteps, finish } from './bulkOptics.ts'
import { DEFAULT_TOLERANCE, type Conditions, type Population, type SizeSegment } from './integrate.ts'
import { OpticsWorkspace } from './workspace.ts'
import { angstromFit, deciview, deciviewWithheld, layerDepthM, localAbsorptionExponents, localAngstromExponents, rayleighScatteringMm, visibilityWithheld, visualRangeKm } from './metrics.ts'
import { particleGrowthAt, particleGrowthSetting, resolveComposition, type ParticleKind } from './particles.ts'
import { sampleLongwaveSteps } from './longwave.ts'
import type { AngularOptics, LongwaveOptics, SampleOptics, WavelengthOptics } from './types.ts'
import { opticsWarnings } from './warnings.ts'

export interface SampleOpticsOptions {
  /** Relative accuracy of the size integration (default 1e-4). */
  tolerance?: number
  /** Scattering angles (degrees) for the population phase function; default 0…180 by 2°. */
  anglesDeg?: number[]
  /** Wavelengths (nm) at which to report the phase function; default 550 nm if present, else the first. */
  angularWavelengthsNm?: number[]
  /** Override the sample's humidity (for f(RH) curves). */
  rhPercent?: number
  /** Workspace to reuse across calls (Mie buffers, angular tables, the node cache). */
  workspace?: OpticsWorkspace
  /** Compute b, β̄ and the phase function (default true); without them those figures are NaN. */
  upscatter?: boolean
  /** The coarsest lattice step of the size integration (see IntegrationOptions.coarsestStep). */
  coarsestStep?: number
  /** Compute the thermal-infrared band optics too (optics/longwave.ts; default true). */
  longwave?: boolean
  /**
   * Only the figures a Monte Carlo draw reads (uncertainty/propagate.ts): the rows without their Ångström
   * exponents, the volumes and masses, the layer depth; the PM fractions and the Ångström fit NaN, no notes and
   * no warnings (default false).
   */
  brief?: boolean
}

export const DEFAULT_ANGLES_DEG: number[] = Array.from({ length: 91 }, (_, i) => 2 * i)

/** The user materials of a study, built and checked at the study's wavelengths. */
export function studyMaterials(study: Pick<Study, 'user_materials' | 'wavelengths_nm'>): Material[] {
  const wl = study.wavelengths_nm.map((w) => w / 1000)
  return (study.user_materials ?? []).map((u) =>
    defineUserMaterial(
      {
        id: u.id,
        name: u.name,
        densityGcm3: u.density_g_cm3,
        kappa: u.kappa,
        source: u.source,
        index: u.index.kind === 'table' ? { kind: 'table', rows: u.index.rows } : u.index
      },
      wl
    )
  )
}

/** A lognormal mode in number form from any of the document's three forms. */
export function modeFromSpec(spec: ModeSpec, density: number): LognormalMode {
  const name = spec.name
  if (spec.by === 'number') return modeFromNumber({ number: spec.number_cm3, median: spec.median_um, gsd: spec.gsd, name })
  if (spec.by === 'volume') return modeFromVolume({ volume: spec.volume_um3_cm3, volumeMedian: spec.median_um, gsd: spec.gsd, name })
  return modeFromMass({ mass: spec.mass_ug_m3, massMedian: spec.median_um, gsd: spec.gsd, density, name })
}

/** One population of a sample, with what the moments need. */
interface SamplePopulation extends Population {
  mode?: LognormalMode
  bins?: SizeBins
}

/** Resolves a sample into populations: one per mode (with its own composition if it has one), or the bins. */
export function samplePopulations(sample: Sample, own: readonly Material[], longestWavelengthUm: number, tolerance = DEFAULT_TOLERANCE): SamplePopulation[] {
  const where = `sample "${sample.name}"`
  const kindCache = new Map<Composition, ParticleKind>()
  const kindOf = (c: Composition, w: string) => {
    let k = kindCache.get(c)
    if (!k) {
      k = resolveComposition(c, own, w)
      kindCache.set(c, k)
    }
    return k
  }
  if (sample.size.kind === 'modes') {
    if (!sample.size.modes.length) throw new InputError(`${where}: modes`, 'the sample has no modes', 'Add a lognormal mode or load measured bins.')
    return sample.size.modes.map((spec, i) => {
      const w = `${where}, mode ${i + 1}${spec.name ? ` (${spec.name})` : ''}`
      const kind = kindOf(spec.composition ?? sample.composition, w)
      const mode = modeFromSpec(spec, kind.densityGcm3)
      return { label: spec.name ?? `mode ${i + 1}`, kind, mode, segments: [modeSegmentAt(mode, longestWavelengthUm, tolerance)] }
    })
  }
  const b = sample.size.bins
  const kind = kindOf(sample.composition, where)
  const bins = binsFromMeasurement({
    diameters: b.diameters,
    diameterKind: b.edges ? 'edges' : 'midpoints',
    diameterUnit: b.diameter_unit,
    quantity: b.quantity,
    values: b.values,
    density: kind.densityGcm3
  })
  const segments: SizeSegment[] = []
  for (let i = 0; i < bins.dNdlogD.length; i++) {
    const dens = bins.dNdlogD[i] / Math.LN10
    if (dens > 0) segments.push({ lo: Math.log(bins.edges[i]), hi: Math.log(bins.edges[i + 1]), flat: true, density: () => dens })
  }
  return [{ label: 'measured bins', kind, bins, segments }]
}

/** The share of a mode's second moment the full computation leaves out (see modeSegment). */
const FULL_TAIL = 1e-6

/**
 * The share of the tolerance that a mode's cut tail of large particles may take (see modeSegment): a tenth, so that
 * at the default tolerance 1e-5 of the second moment is left out (5e-6 above the range).
 */
const TAIL_SHARE = 0.1

/** A mode's segment for an integration to `tolerance` (its tail TAIL_SHARE of it, at most the full range's). */
function modeSegmentAt(mode: LognormalMode, longestWavelengthUm: number, tolerance: number): SizeSegment {
  return modeSegment(mode, longestWavelengthUm, integrationTail(tolerance))
}

/** The share of a mode's second moment an integration to `tolerance` leaves out among large particles. */
function integrationTail(tolerance: number): number {
  return Math.max(FULL_TAIL, tolerance * TAIL_SHARE)
}

/**
 * Beyond this size parameter Q_ext stays within about a fifth of 2 for n ≥ 1.33: by anomalous diffraction,
 * Q_ext = 2 − (4/ρ) sin ρ + (4/ρ²)(1 − cos ρ) with ρ = 2x(n − 1) (van de Hulst 1957, §11.22).
 */
const GEOMETRIC_X = 20

/**
 * The diameter range of a mode for optics: all but 1e-6 of its second moment, which carries the cross-sections
 * of particles large next to the wavelength (C ∝ D²), extended upward to hold the sixth moment (which carries
 * Rayleigh scattering, C ∝ D⁶) as far as particles stay small next to the longest wavelength (x ≤ 2 there).
 *
 * An integration to a tolerance stops sooner among large particles: at the diameter past which only `tail` (a
 * tenth of its tolerance, TAIL_SHARE: 1e-5 at the default 1e-4, 1e-3 for a quick pass) of the second moment lies,
 * if even at the longest wavelength the particles there are large (x ≥ GEOMETRIC_X, so that Q_ext ≈ 2 and the
 * second moment measures their share of σ): what is left out is then about `tail` of the mode's σ, a one-sided
 * error within the tolerance. The largest particles, which cost most per node (their Mie series has about x
 * terms), are the ones it leaves out. Where the cut would fall among smaller particles (fine modes, whose Q_ext
 * still climbs steeply with size there), it stays where the 1e-6 range puts it. (A hundredth of the tolerance was
 * used before; measured in DEVELOPERS.md, "Where the coarse samples' work goes".)
 */
function modeSegment(mode: LognormalMode, longestWavelengthUm: number, tail: number): SizeSegment {
  const r2 = integrationRange([mode], { highestMoment: 2, tailFraction: FULL_TAIL })
  const r6 = integrationRange([mode], { highestMoment: 6, tailFraction: FULL_TAIL })
  const small = (2 * longestWavelengthUm) / Math.PI
  const large = (GEOMETRIC_X * longestWavelengthUm) / Math.PI
  const cut = tail > FULL_TAIL ? integrationRange([mode], { highestMoment: 2, tailFraction: tail }).max : r2.max
  const hi = Math.max(cut, Math.min(r2.max, large), Math.min(r6.max, small))
  return { lo: Math.log(r2.min), hi: Math.log(hi), flat: false, density: dNdlnDOfLnD(mode) }
}

const GAUSS2 = [0.5 - 0.5 / Math.sqrt(3), 0.5 + 0.5 / Math.sqrt(3)]

/**
 * Number, surface, dry and wet volume (µm³ cm⁻³) and dry and wet mass (µg m⁻³) of the populations at a
 * humidity. The dry moments are exact (Hatch–Choate for modes, exact bin integrals for bins); the water taken
 * up, whose growth factor depends on size through the Kelvin term, scales each population's dry volume by the
 * volume-weighted mean of gf³, integrated by 2-point Gauss panels in ln D over the population's range.
 */
function populationVolumes(pops: SamplePopulation[], cond: Conditions): { dryVolume: number; wetVolume: number; dryMass: number; wetMass: number; number: number; surface: number } {
  let dryVolume = 0
  let wetVolume = 0
  let dryMass = 0
  let number = 0
  let surface = 0
  for (const p of pops) {
    const n = p.mode ? numberConcentration(p.mode) : binNumberConcentration(p.bins!)
    const s = p.mode ? surfaceConcentration(p.mode) : binSurfaceConcentration(p.bins!)
    const v = p.mode ? volumeConcentration(p.mode) : binVolumeConcentration(p.bins!)
    let vSum = 0
    let wetSum = 0
    let growth: ReturnType<typeof particleGrowthSetting> | undefined // at the first point, which throws where it is bad
    for (const seg of p.segments) {
      const panels = p.mode ? 96 : 8
      const h = (seg.hi - seg.lo) / panels
      for (let i = 0; i < panels; i++) {
        for (const off of GAUSS2) {
          const u = seg.lo + (i + off) * h
          const d = Math.exp(u)
          const dv = seg.density(u) * d * d * d
          if (growth === undefined) growth = particleGrowthSetting(p.kind, cond.rhPercent, cond.history, cond.temperatureK)
          const gf = particleGrowthAt(growth, d)
          vSum += dv
          wetSum += dv * gf * gf * gf
        }
      }
    }
    number += n
    surface += s
    dryVolume += v
    wetVolume += vSum > 0 ? (v * wetSum) / vSum : v
    dryMass += v * p.kind.densityGcm3
  }
  // water density 0.997 g cm⁻³ (Kell 1975, from memory)
  return { dryVolume, wetVolume, dryMass, wetMass: dryMass + (wetVolume - dryVolume) * 0.997, number, surface }
}

/** Everything optical about one sample at the study's wavelengths. */
export function computeSampleOptics(sample: Sample, study: Pick<Study, 'user_materials' | 'wavelengths_nm'>, options: SampleOpticsOptions = {}, own: Material[] = studyMaterials(study)): SampleOptics {
  return finish(sampleOpticsSteps(sample, study, options, own))
}

export { finish }

/**
 * computeSampleOptics in steps: the generator pauses every few milliseconds of work (see bulkOpticsSteps) and
 * after each wavelength, and returns the sample's optics at the end. A caller that must stay responsive (the app's worker) can look for newer work between steps.
 */
export function* sampleOpticsSteps(sample: Sample, study: Pick<Study, 'user_materials' | 'wavelengths_nm'>, options: SampleOpticsOptions = {}, own: Material[] = studyMaterials(study)): Generator<void, SampleOptics> {
  // the populations are made once: the integration's at its tolerance, the volumes' over the full range from them
  const setting = sampleSetting(sample, study, options, own)
  const bulk = yield* sampleBulkSteps(sample, study, options, own, setting)
  const longwave = options.longwave === false ? undefined : yield* sampleLongwaveSteps(sample, study, { workspace: options.workspace, tolerance: options.tolerance })
  return assembleSampleOptics(sample, study, bulk, { ...options, longwave }, own, fullRangeSetting(setting, study, options.tolerance))
}

/** One wavelength's bulk optics as the size integration gives them, before the figures derived from them. */
export interface WavelengthBulk {
  wavelength_nm: number
  ext: number
  sca: number
  abs: number
  g: number
  backscatter: number
  upscatter_mean: number
  upscatter: number[]
  /** The phase function and polarisation, at the angular wavelengths only. */
  angular: AngularOptics | null
  evaluations: number
  converged: boolean
}

/** The sample's conditions and populations, as both halves of the computation (and the infrared's) see them. */
export function sampleSetting(sample: Sample, study: Pick<Study, 'user_materials' | 'wavelengths_nm'>, options: Pick<SampleOpticsOptions, 'rhPercent' | 'tolerance'>, own: Material[]) {
  const wavelengths = study.wavelengths_nm
  if (!wavelengths.length) throw new InputError('study: wavelengths', 'no wavelengths are given', 'Add at least one wavelength, such as 550 nm.')
  // the longest of all the study's wavelengths (not of a share of them) sets the modes' ranges, so that a
  // computation split by wavelength integrates over the same sizes as a whole one
  const pops = samplePopulations(sample, own, Math.max(...wavelengths) / 1000, options.tolerance)
  const cond: Conditions = { rhPercent: options.rhPercent ?? sample.rh_percent, history: sample.rh_history, temperatureK: sample.temperature_k ?? 298.15 }
  return { pops, cond }
}

type SampleSetting = ReturnType<typeof sampleSetting>

/**
 * The setting of assembleSampleOptics (the populations over the full range, at the default tolerance's tails) from
 * one sampleSetting made at `tolerance` with the same humidity: the same particle kinds, modes and bins, each
 * mode's segment made again where the tolerance cut it shorter. The same populations as sampleSetting at the
 * default tolerance, to the bit.
 */
function fullRangeSetting(setting: SampleSetting, study: Pick<Study, 'wavelengths_nm'>, tolerance = DEFAULT_TOLERANCE): SampleSetting {
  if (integrationTail(tolerance) === integrationTail(DEFAULT_TOLERANCE)) return setting
  const longest = Math.max(...study.wavelengths_nm) / 1000
  const pops = setting.pops.map((p) => (p.mode ? { ...p, segments: [modeSegmentAt(p.mode, longest, DEFAULT_TOLERANCE)] } : p))
  return { pops, cond: setting.cond }
}

/** The wavelength whose phase function and polarisation are computed unless others are asked for: 550 nm if the study has it, else its first. */
export function phaseFunctionWavelengthNm(wavelengthsNm: readonly number[]): number {
  return wavelengthsNm.includes(550) ? 550 : wavelengthsNm[0]
}

/**
 * The size integration of a sample at its study's wavelengths, or at `only` (a share of them, for a computation
 * split across workers): one WavelengthBulk per wavelength, pausing every few milliseconds of work.
 */
export function* sampleBulkSteps(
  sample: Sample,
  study: Pick<Study, 'user_materials' | 'wavelengths_nm'>,
  options: SampleOpticsOptions & { only?: readonly number[] } = {},
  own: Material[] = studyMaterials(study),
  setting = sampleSetting(sample, study, options, own)
): Generator<void, WavelengthBulk[]> {
  const { pops, cond } = setting
  const wavelengths = study.wavelengths_nm
  const ws = options.workspace ?? new OpticsWorkspace()
  const angularAt = options.angularWavelengthsNm ?? [phaseFunctionWavelengthNm(wavelengths)]
  const angles = options.anglesDeg ?? DEFAULT_ANGLES_DEG
  const out: WavelengthBulk[] = []
  for (const wl of options.only ?? wavelengths) {
    const wantAngles = angularAt.includes(wl)
    const r = yield* bulkOpticsSteps(pops, wl / 1000, cond, { tolerance: options.tolerance, anglesDeg: wantAngles ? angles : undefined, upscatter: options.upscatter, coarsestStep: options.coarsestStep }, ws)
    out.push({
      wavelength_nm: wl,
      ext: r.ext,
      sca: r.sca,
      abs: r.abs,
      g: r.g,
      backscatter: r.backscatter,
      upscatter_mean: r.upscatterMean,
      upscatter: Array.from(r.upscatter),
      angular: wantAngles && r.phase && r.polarization ? { wavelength_nm: wl, angles_deg: angles.slice(), phase: Array.from(r.phase), polarization: Array.from(r.polarization) } : null,
      evaluations: r.evaluations,
      converged: r.converged
    })
    yield
  }
  return out
}

/**
 * A sample's optics from the bulk optics at each of its study's wavelengths (in any order, from one computation
 * or several): mass efficiencies, visual range, haze index, optical depth, PM fractions, Ångström fit, notes.
 */
export function assembleSampleOptics(
  sample: Sample,
  study: Pick<Study, 'user_materials' | 'wavelengths_nm'>,
  bulk: readonly WavelengthBulk[],
  options: Pick<SampleOpticsOptions, 'rhPercent' | 'brief'> & { longwave?: LongwaveOptics } = {},
  own: Material[] = studyMaterials(study),
  // the volumes (and so the mass efficiencies) come from the full range, whatever the integration's tolerance
  setting = sampleSetting(sample, study, { rhPercent: options.rhPercent }, own)
): SampleOptics {
  const { pops, cond } = setting
  const vol = populationVolumes(pops, cond)
  const rows: WavelengthOptics[] = []
  const angular: AngularOptics[] = []
  const unsettled: number[] = []
  for (const wl of study.wavelengths_nm) {
    const r = bulk.find((b) => b.wavelength_nm === wl)
    if (!r) throw new Error(`assembleSampleOptics: no bulk optics at ${wl} nm`)
    if (!r.converged) unsettled.push(wl)
    const rayleigh = rayleighScatteringMm(wl / 1000)
    const total = r.ext + rayleigh
    rows.push({
      wavelength_nm: wl,
      ext: r.ext,
      sca: r.sca,
      abs: r.abs,
      ssa: r.ext > 0 ? r.sca / r.ext : 1,
      g: r.g,
      backscatter_fraction: r.backscatter,
      upscatter_fraction: r.upscatter_mean,
      upscatter_by_cos_zenith: r.upscatter.slice(),
      mass_ext_dry: r.ext / vol.dryMass,
      mass_sca_dry: r.sca / vol.dryMass,
      mass_abs_dry: r.abs / vol.dryMass,
      mass_ext_wet: r.ext / vol.wetMass,
      mass_sca_wet: r.sca / vol.wetMass,
      mass_abs_wet: r.abs / vol.wetMass,
      angstrom_ext: NaN,
      angstrom_abs: NaN,
      optical_depth: 0,
      rayleigh_sca: rayleigh,
      visual_range_km: visibilityWithheld(wl) ? NaN : visualRangeKm(total),
      deciview: deciviewWithheld(wl, total) ? NaN : deciview(total),
      mie_evaluations: r.evaluations,
      withheld: {}
    })
    const row = rows[rows.length - 1]
    const vis = visibilityWithheld(wl)
    if (vis) row.withheld.visual_range_km = vis
    const dv = deciviewWithheld(wl, total)
    if (dv) row.withheld.deciview = dv
    if (r.angular) angular.push(r.angular)
  }
  // Optical depth: a uniform layer of the sample (Mm⁻¹ × m × 1e-6), or scaled to a given AOD at 550 nm.
  let layerDepth = layerDepthM(sample.layer)
  if (sample.layer.kind === 'optical-depth') {
    const ext550 = extinctionAt(rows, 550)
    layerDepth = ext550 > 0 ? sample.layer.aod_550 / (ext550 * 1e-6) : 0
  }
  for (const row of rows) row.optical_depth = row.ext * 1e-6 * layerDepth
  if (options.brief) return briefOptics(sample, rows, angular, vol, layerDepth, options.longwave)
  const wls = rows.map((r) => r.wavelength_nm)
  const aExt = localAngstromExponents(wls, rows.map((r) => r.ext))
  const aAbs = localAbsorptionExponents(wls, rows.map((r) => r.abs), rows.map((r) => r.ext))
  rows.forEach((r, i) => {
    r.angstrom_ext = aExt[i]
    r.angstrom_abs = aAbs[i].value
    if (aAbs[i].withheld) r.withheld.angstrom_abs = aAbs[i].withheld!
  })

  const pm = pops.every((p) => p.mode)
    ? particulateMatter(pops.map((p) => p.mode!), { diameter: 'geometric', density: pops.map((p) => p.kind.densityGcm3) })
    : pops.length === 1 && pops[0].bins
      ? particulateMatterBins(pops[0].bins, { diameter: 'geometric', density: pops[0].kind.densityGcm3 })
      : null
  const notes = [
    'Mass efficiencies per gram of dry particle matter (dry) and per gram including particle water at the sample humidity (wet).',
    `Visual range and haze index include the air's Rayleigh scattering at sea level (${rows.length ? rows[0].rayleigh_sca.toFixed(1) : '—'} Mm⁻¹ at ${rows[0]?.wavelength_nm} nm).`,
    'PM fractions by geometric (volume-equivalent) dry diameter.',
    `Upscatter fraction β̄ = ∫₀¹ β(μ₀) dμ₀, taken as the mean scattering angle over π (the same integral); β(μ₀) at ${UPSCATTER_COS_ZENITH.length} sun angles.`
  ]
  if (pops.some((p) => p.bins)) notes.push(BIN_SHAPE)
  // the brief result's fields filled in, in their order
  const out = briefOptics(sample, rows, angular, vol, layerDepth, options.longwave)
  if (pm) {
    out.pm1_ug_m3 = pm.pm1
    out.pm2_5_ug_m3 = pm.pm2_5
    out.pm10_ug_m3 = pm.pm10
  }
  out.angstrom_fit = angstromFit(rows)
  out.notes = notes
  out.warnings = opticsWarnings({ rhPercent: cond.rhPercent, kappa: Math.max(0, ...pops.map((p) => p.kind.kappa)), unsettledNm: unsettled })
  return out
}

/** assembleSampleOptics's result with `brief` (see SampleOpticsOptions.brief). */
function briefOptics(sample: Sample, rows: WavelengthOptics[], angular: AngularOptics[], vol: ReturnType<typeof populationVolumes>, layerDepth: number, longwave: LongwaveOptics | undefined): SampleOptics {
  return {
    name: sample.name,
    wavelengths: rows,
    angular,
    number_cm3: vol.number,
    surface_um2_cm3: vol.surface,
    volume_um3_cm3: vol.dryVolume,
    mass_ug_m3: vol.dryMass,
    wet_volume_um3_cm3: vol.wetVolume,
    wet_mass_ug_m3: vol.wetMass,
    pm1_ug_m3: NaN,
    pm2_5_ug_m3: NaN,
    pm10_ug_m3: NaN,
    angstrom_fit: { ext: NaN, sca: NaN, abs: NaN },
    layer_depth_m: layerDepth,
    ...(longwave ? { longwave } : {}),
    notes: [],
    warnings: []
  }
}

/** σext at a wavelength (nm), interpolated log–log between the nearest rows if it is not one of them. */
export function extinctionAt(rows: readonly WavelengthOptics[], wavelengthNm: number): number {
  return valueAt(rows, wavelengthNm, (r) => r.ext)
}

/** A row figure at a wavelength (nm): exact if tabulated, else log–log interpolation (or the nearest end). */
export function valueAt(rows: readonly WavelengthOptics[], wavelengthNm: number, pick: (r: WavelengthOptics) => number): number {
  const exact = rows.find((r) => r.wavelength_nm === wavelengthNm)
  if (exact) return pick(exact)
  const sorted = [...rows].sort((a, b) => a.wavelength_nm - b.wavelength_nm)
  if (!sorted.length) return NaN
  if (wavelengthNm <= sorted[0].wavelength_nm) return pick(sorted[0])
  if (wavelengthNm >= sorted[sorted.length - 1].wavelength_nm) return pick(sorted[sorted.length - 1])
  let i = 0
  while (sorted[i + 1].wavelength_nm < wavelengthNm) i++
  const a = sorted[i]
  const b = sorted[i + 1]
  const t = Math.log(wavelengthNm / a.wavelength_nm) / Math.log(b.wavelength_nm / a.wavelength_nm)
  const va = pick(a)
  const vb = pick(b)
  return va > 0 && vb > 0 ? Math.exp(Math.log(va) + t * Math.log(vb / va)) : va + t * (vb - va)
}
