/**
 * The thermal-infrared (longwave) bands of the layer's infrared forcing, with the simple gas transmittance of each.
 *
 * Twelve bands from 4 to 40 µm: they resolve the 8–13 µm window in 1 µm steps (the silicate band of dust at
 * 9–10 µm, the sulfate band near 9 µm, ozone's 9.6 µm band), the water-vapour band at 6.3 µm, carbon dioxide's
 * 15 µm band and the far-infrared water rotation bands with the silicate bending band near 20 µm. Below 4 µm a
 * 180–350 K body emits under 2 % of its energy (blackbody fraction); beyond 40 µm the water-vapour rotation band
 * makes humid air nearly opaque, so the layer's effect there is left out (stated in every result's method text).
 *
 * The gases are a stated, simple screening model, not a line-by-line or band-model computation: in each band a
 * grey flux transmittance exp(−k_w W) for a water-vapour path W (g cm⁻², i.e. cm of precipitable water), times
 * exp(−τ_m p/p₀) for the well-mixed gases (CO₂, CH₄, N₂O) in proportion to the pressure path, times exp(−τ_O₃) for
 * stratospheric ozone. The numbers are rough band means chosen to give the familiar picture (window transmittance
 * about 0.75 for 2.5 cm of water, opaque 6.3 µm and 15 µm bands, an opaque far infrared beyond about 25 µm); they
 * are assumed values recalled from textbook figures of atmospheric transmission (Liou 2002, An Introduction to
 * Atmospheric Radiation, 2nd ed., ch. 4; from memory), not fitted to any measurement, and they are the weakest
 * part of the infrared forcing. The water continuum, which grows with the square of humidity, is taken as linear.
 */

export interface LongwaveBand {
  /** Band edges, µm. */
  loUm: number
  hiUm: number
  /** Plain-words label. */
  label: string
  /** Water-vapour flux absorption coefficient, per g cm⁻² of precipitable water. */
  waterPerCm: number
  /** Flux optical depth of the well-mixed gases for the whole column at standard pressure. */
  mixedGasDepth: number
  /** Flux optical depth of stratospheric ozone. */
  ozoneDepth: number
  /** Wavelengths (µm) at which the particles' optics are computed for this band: centres of equal sub-bands. */
  nodesUm: readonly number[]
}

function band(loUm: number, hiUm: number, label: string, waterPerCm: number, mixedGasDepth: number, ozoneDepth: number, nodes: number): LongwaveBand {
  const w = (hiUm - loUm) / nodes
  const nodesUm = Object.freeze(Array.from({ length: nodes }, (_, i) => Number((loUm + (i + 0.5) * w).toFixed(4))))
  return Object.freeze({ loUm, hiUm, label, waterPerCm, mixedGasDepth, ozoneDepth, nodesUm })
}

/** The bands (assumed gas values, see the module note). */
export const LONGWAVE_BANDS: readonly LongwaveBand[] = Object.freeze([
  band(4, 5.5, 'CO₂ 4.3 µm and water wing', 0.6, 1.0, 0, 1),
  band(5.5, 7.5, 'water vapour 6.3 µm band', 5, 0.1, 0, 2),
  band(7.5, 8.5, 'window edge (CH₄, N₂O)', 0.5, 0.3, 0, 1),
  band(8.5, 9.5, 'window: sulfate and silicate bands', 0.12, 0, 0.05, 1),
  band(9.5, 10.5, 'window: ozone 9.6 µm, silicate band', 0.1, 0, 0.6, 1),
  band(10.5, 11.5, 'window', 0.1, 0, 0, 1),
  band(11.5, 12.5, 'window', 0.15, 0, 0, 1),
  band(12.5, 14, 'window edge (CO₂ wing)', 0.3, 1.0, 0, 1),
  band(14, 16, 'CO₂ 15 µm band', 0.3, 20, 0, 1),
  band(16, 20, 'CO₂ wing, water rotation', 1.0, 0.5, 0, 2),
  band(20, 25, 'water rotation, silicate 20 µm band', 2, 0, 0, 2),
  band(25, 40, 'water rotation (far infrared)', 6, 0, 0, 3)
])

/** Shortest and longest wavelength of the bands, µm. */
export const LONGWAVE_RANGE_UM: readonly [number, number] = Object.freeze([4, 40]) as readonly [number, number]

/** Every band's particle-optics wavelengths in band order, µm. */
export function longwaveNodeWavelengthsUm(): number[] {
  return LONGWAVE_BANDS.flatMap((b) => b.nodesUm)
}

/** Temperature of the blackbody that weights a band's sub-bands when its particle optics are averaged, K (a mid-troposphere value, common practice). */
export const LONGWAVE_WEIGHT_TEMPERATURE_K = 270

/** Particle optics of a layer in one band: coefficients (any unit, e.g. Mm⁻¹) and the asymmetry parameter. */
export interface BandParticleOptics {
  ext: number
  sca: number
  g: number
}

/**
 * A band's particle optics from its nodes' optics: extinction and scattering averaged with the weights of a
 * LONGWAVE_WEIGHT_TEMPERATURE_K blackbody over each node's sub-band, g weighted by scattering.
 * `nodes` holds the band's nodes in order (as LongwaveBand.nodesUm).
 */
export function bandAverage(b: LongwaveBand, nodes: readonly BandParticleOptics[], weightOf: (loUm: number, hiUm: number) => number): BandParticleOptics {
  if (nodes.length !== b.nodesUm.length) throw new RangeError(`bandAverage: ${nodes.length} nodes for a band of ${b.nodesUm.length}`)
  const w = (b.hiUm - b.loUm) / nodes.length
  let sw = 0
  let ext = 0
  let sca = 0
  let gs = 0
  nodes.forEach((o, i) => {
    const wt = weightOf(b.loUm + i * w, b.loUm + (i + 1) * w)
    sw += wt
    ext += wt * o.ext
    sca += wt * o.sca
    gs += wt * o.sca * o.g
  })
  return { ext: ext / sw, sca: sca / sw, g: sca > 0 ? gs / sca : 0 }
}
