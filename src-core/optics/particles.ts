/**
 * From composition and humidity to the particle that Mie theory sees: for a dry diameter and a
 * wavelength, the wet diameter and the refractive index (or the core and shell indices).
 *
 * - Internal mixtures: the dry index by the composition's rule (volume average, Maxwell Garnett with the
 *   first component as host, or Bruggeman); water taken up is mixed in by the same family of rule (for
 *   Maxwell Garnett, water is the host of the wet particle).
 * - Core–shell: the first component is the core (its share of the dry volume sets the core diameter,
 *   D_core = D_dry f_core^(1/3)); the other components, volume-averaged, are the shell; water joins the shell.
 * - Water uptake by κ-Köhler with the Kelvin term (Petters & Kreidenweis 2007); κ of the particle is the
 *   volume-weighted mean of its components unless the composition gives one. A crystalline salt that makes
 *   up at least half of the dry volume brings its deliquescence/efflorescence hysteresis, on the branch
 *   chosen by the sample's humidity history.
 */
import { InputError } from '../errors.ts'
import {
  getMaterial,
  growthFactor,
  growthFactorAt,
  growthSetting,
  mixRefractiveIndices,
  mixtureKappa,
  refractiveIndexAt,
  volumeAverageOfTwo,
  type ComplexRefractiveIndex,
  type GrowthSetting,
  type Material,
  type MixingRule,
  type PhaseChange
} from '../materials/index.ts'
import type { Composition } from '../study/model.ts'

/** What a particle is made of, resolved against the catalogue and the study's own materials. */
export interface ParticleKind {
  label: string
  coreShell: boolean
  /** Components in the composition's order, with their dry volume fractions (summing to 1). */
  materials: Material[]
  fractions: number[]
  rule: MixingRule
  densityGcm3: number
  kappa: number
  phaseChange?: PhaseChange
}

/** A particle's refractive indices at one wavelength, before water. */
export interface DryIndices {
  wavelengthUm: number
  /** Whole-particle dry index (internal mixtures) or the shell's dry index (core–shell). */
  matrix: ComplexRefractiveIndex
  /** The core's index (core–shell only). */
  core?: ComplexRefractiveIndex
  water: ComplexRefractiveIndex
}

/** Looks up a component: the study's own materials first, then the catalogue. */
export function resolveMaterial(id: string, own: readonly Material[], where: string): Material {
  const m = own.find((u) => u.id === id)
  if (m) return m
  try {
    return getMaterial(id)
  } catch (e) {
    if (e instanceof InputError) throw new InputError(where, e.message.replace(/^[^:]*: /, ''), e.fix)
    throw e
  }
}

/** Resolves a composition. `where` names it in messages (e.g. "sample 'Winter smoke', mode 2"). */
export function resolveComposition(c: Composition, own: readonly Material[], where: string): ParticleKind {
  if (!c.components.length) throw new InputError(`${where}: composition`, 'no components are given', 'Add at least one component.')
  const materials = c.components.map((s, i) => resolveMaterial(s.material, own, `${where}: component ${i + 1}`))
  const raw = c.components.map((s) => s.volume_fraction)
  const sum = raw.reduce((a, b) => a + b, 0)
  if (raw.some((f) => !(f >= 0)) || !(Math.abs(sum - 1) <= 1e-6)) {
    throw new InputError(`${where}: volume fractions`, `the fractions ${raw.join(', ')} sum to ${sum}, not 1`, 'Make the volume fractions add up to 1.')
  }
  const fractions = raw.map((f) => f / sum)
  const coreShell = c.mixing === 'core-shell'
  if (coreShell && materials.length < 2) {
    throw new InputError(`${where}: mixing`, 'a core–shell particle needs a core and at least one shell component', 'Add a shell component, or choose an internal mixing rule.')
  }
  const rule: MixingRule = c.mixing === 'core-shell' ? 'volume-average' : c.mixing
  const densityGcm3 = c.density_g_cm3 ?? materials.reduce((s, m, i) => s + m.densityGcm3 * fractions[i], 0)
  const kappa = c.kappa ?? mixtureKappa(materials.map((m) => m.kappa), fractions)
  let phaseChange: PhaseChange | undefined
  let best = -1
  materials.forEach((m, i) => {
    if (m.phaseChange && fractions[i] >= 0.5 && fractions[i] > best) {
      best = fractions[i]
      phaseChange = m.phaseChange
    }
  })
  const label = materials.map((m, i) => `${m.id} ${(fractions[i] * 100).toFixed(0)}%`).join(' + ')
  return { label, coreShell, materials, fractions, rule, densityGcm3, kappa, phaseChange }
}

/** The dry indices of a particle kind at a wavelength (µm). */
export function dryIndicesAt(p: ParticleKind, wavelengthUm: number): DryIndices {
  const water = refractiveIndexAt(getMaterial('water'), wavelengthUm)
  const idx = p.materials.map((m) => refractiveIndexAt(m, wavelengthUm))
  if (!p.coreShell) {
    const matrix = idx.length === 1 ? idx[0] : mixRefractiveIndices(idx, p.fractions, p.rule)
    return { wavelengthUm, matrix, water }
  }
  const shellIdx = idx.slice(1)
  const shellTotal = 1 - p.fractions[0]
  const shellFractions = p.fractions.slice(1).map((f) => f / shellTotal)
  const matrix = shellIdx.length === 1 ? shellIdx[0] : mixRefractiveIndices(shellIdx, shellFractions, 'volume-average')
  return { wavelengthUm, matrix, core: idx[0], water }
}

/** Growth factor D_wet/D_dry of this particle kind at a dry diameter (µm). */
export function particleGrowth(p: ParticleKind, dryDiameterUm: number, rhPercent: number, history: 'rising' | 'falling', temperatureK: number): number {
  if (rhPercent === 0 || p.kappa === 0) return 1
  return growthFactor(dryDiameterUm, p.kappa, rhPercent, { temperatureK, phaseChange: p.phaseChange, history })
}

/**
 * particleGrowth for many dry diameters at one humidity: what depends on the kind and the conditions only, worked
 * out once (null where every diameter grows by 1); particleGrowthAt(setting, D) is particleGrowth(…, D) to the bit.
 */
export function particleGrowthSetting(p: ParticleKind, rhPercent: number, history: 'rising' | 'falling', temperatureK: number): GrowthSetting | null {
  if (rhPercent === 0 || p.kappa === 0) return null
  return growthSetting(p.kappa, rhPercent, { temperatureK, phaseChange: p.phaseChange, history })
}

/** Growth factor at a dry diameter (µm) for a setting from particleGrowthSetting. */
export function particleGrowthAt(setting: GrowthSetting | null, dryDiameterUm: number): number {
  return setting ? growthFactorAt(dryDiameterUm, setting) : 1
}

/** The rule for mixing water into the dry matrix. */
function waterRule(p: ParticleKind): MixingRule {
  return p.rule === 'bruggeman' ? 'bruggeman' : p.rule === 'maxwell-garnett' ? 'maxwell-garnett' : 'volume-average'
}

/**
 * The particle Mie theory sees, at growth factor `gf`: the index of the whole wet particle, or of the wet
 * shell and the core with the core's share of the outer diameter. Writes into `out`.
 */
export interface WetParticle {
  n: number
  k: number
  /** Core diameter / outer diameter (0 for a homogeneous particle). */
  coreRatio: number
  coreN: number
  coreK: number
}

export function wetParticle(p: ParticleKind, d: DryIndices, gf: number, out: WetParticle): WetParticle {
  const gf3 = gf * gf * gf
  if (!p.coreShell) {
    let m = d.matrix
    if (gf3 > 1) {
      const fw = 1 - 1 / gf3
      const rule = waterRule(p)
      if (rule === 'volume-average' && volumeAverageOfTwo(d.matrix, d.water, 1 - fw, fw, out)) {
        out.coreRatio = 0
        return out
      }
      m = mixRefractiveIndices(rule === 'maxwell-garnett' ? [d.water, d.matrix] : [d.matrix, d.water], rule === 'maxwell-garnett' ? [fw, 1 - fw] : [1 - fw, fw], rule)
    }
    out.n = m.n
    out.k = m.k
    out.coreRatio = 0
    return out
  }
  // Volumes per unit dry volume: core f_c, dry shell 1 − f_c, water gf³ − 1.
  const fc = p.fractions[0]
  const shellDry = 1 - fc
  const water = gf3 - 1
  let m = d.matrix
  if (water > 0) {
    const fw = water / (water + shellDry)
    if (!volumeAverageOfTwo(d.matrix, d.water, 1 - fw, fw, out)) m = mixRefractiveIndices([d.matrix, d.water], [1 - fw, fw], 'volume-average')
    else m = out
  }
  out.n = m.n
  out.k = m.k
  out.coreRatio = Math.cbrt(fc / gf3)
  out.coreN = d.core!.n
  out.coreK = d.core!.k
  return out
}
