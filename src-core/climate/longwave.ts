/**
 * The thermal-infrared (longwave) forcing of a uniform aerosol layer: the change in outgoing infrared at the top
 * of the atmosphere and in the net infrared at the surface when the layer is put into a simple model atmosphere.
 *
 * The model: a surface of temperature T_s and emissivity ε, grey or given per band (the rest reflected, Lambertian); air whose
 * temperature falls at a standard lapse rate (6.5 K km⁻¹, common practice; the U.S. Standard Atmosphere 1976's
 * value) up to the tropopause at 11 km and stays constant above, to a model top at 50 km; water vapour falling off
 * with a 2 km scale height (common practice) and pressure with an 8 km one (common practice); ozone between 15 and
 * 35 km. The gases absorb and emit with the stated band transmittances of longwaveBands.ts. The aerosol layer is
 * centred on its height with its own depth (never reaching below the ground), and shares its optical depth evenly
 * over its part of the atmosphere. The atmosphere is cut into levels 1 km apart in the troposphere (and at the
 * layer's faces), each slab's temperature linear in optical depth between its faces, and solved in each band by
 * the hemispheric-mean two-stream with thermal emission (thermalTwoStream.ts, Toon et al. 1989), once with the
 * layer and once without.
 *
 * Sign: positive warms. TOA forcing = outgoing infrared without the layer − with it; surface forcing = net
 * downward infrared at the surface with the layer − without it. As for the sunlight part, cloudy skies are taken as
 * unforced: both are the clear-sky figures times (1 − cloud fraction). The layer's effect beyond 40 µm and below
 * 4 µm is left out (see longwaveBands.ts).
 */
import { InputError } from '../errors.ts'
import { readableNumber } from '../numberText.ts'
import { DEFAULT_CLOUD_FRACTION } from './constants.ts'
import { LONGWAVE_BANDS } from './longwaveBands.ts'
import { planckBandFluxes } from './planck.ts'
import { thermalTwoStream, HEMISPHERIC_MEAN_DIFFUSIVITY, type ThermalLayer } from './thermalTwoStream.ts'
import { checkRange } from './validate.ts'

/** Standard tropospheric lapse rate, K km⁻¹ (common practice; U.S. Standard Atmosphere 1976). */
export const STANDARD_LAPSE_RATE_K_PER_KM = 6.5
/** Tropopause height of the model atmosphere, km (U.S. Standard Atmosphere 1976). */
export const TROPOPAUSE_KM = 11
/** Scale height of water vapour, km (common practice). */
export const WATER_SCALE_HEIGHT_KM = 2
/** Scale height of pressure, km (common practice). */
export const PRESSURE_SCALE_HEIGHT_KM = 8
const OZONE_KM: readonly [number, number] = [15, 35]
const MODEL_TOP_KM = 50

/** The ranges of the site's infrared inputs, with the reason for each (the one place they live). */
export const LONGWAVE_INPUT_RANGES = Object.freeze({
  surface_temperature_k: { lo: 180, hi: 350, unit: 'K', why: 'the coldest (about 184 K) to the hottest (about 345 K) land surfaces measured' },
  surface_emissivity: { lo: 0.5, hi: 1, unit: '', why: 'natural surfaces emit 0.6 to 1 of a blackbody over the thermal infrared; below 0.5 is a metal, not a landscape' },
  layer_height_km: { lo: 0, hi: 15, unit: 'km', why: "the height of the layer's middle above the ground, within the model's troposphere and lower stratosphere" },
  water_column_cm: { lo: 0, hi: 10, unit: 'cm', why: 'precipitable water runs from near 0 (polar winter) to about 7 cm (humid tropics)' }
})

/** Defaults a user can read and change: 288 K (15 °C, the U.S. Standard Atmosphere 1976 sea level), 1 km, 2.5 cm. */
export const DEFAULT_SURFACE_TEMPERATURE_K = 288.15
/** A boundary-layer aerosol's middle (common practice). */
export const DEFAULT_LAYER_HEIGHT_KM = 1
/** About the global mean of precipitable water (Trenberth, Fasullo & Smith 2005, Clim. Dyn. 24:741; from memory). */
export const DEFAULT_WATER_COLUMN_CM = 2.5

export type LongwaveInputName = keyof typeof LONGWAVE_INPUT_RANGES

/** Checks one infrared site input against its range; throws InputError naming the field, the range and the reason. */
export function checkLongwaveInput(name: LongwaveInputName, value: number, where: string = name): void {
  const r = LONGWAVE_INPUT_RANGES[name]
  if (typeof value !== 'number' || !Number.isFinite(value) || value < r.lo || value > r.hi) {
    const u = r.unit ? ` ${r.unit}` : ''
    throw new InputError(where, `${readableNumber(value)}${u} is outside ${readableNumber(r.lo)} to ${readableNumber(r.hi)}${u} (${r.why})`, `Give a value from ${readableNumber(r.lo)} to ${readableNumber(r.hi)}${u}.`)
  }
}

/** The aerosol layer's optics in one band (LONGWAVE_BANDS order). */
export interface LongwaveLayerBand {
  tau: number
  omega: number
  g: number
}

export interface LongwaveForcingInput {
  /** One entry per LONGWAVE_BANDS band. */
  bands: readonly LongwaveLayerBand[]
  surfaceTemperatureK: number
  /** The surface's infrared emissivity: one (grey) value, or one per LONGWAVE_BANDS band. */
  surfaceEmissivity: number | readonly number[]
  /** Height of the layer's middle above the ground, km. */
  layerHeightKm: number
  /** The layer's depth, km (cut so that it never reaches below the ground). */
  layerDepthKm: number
  /** Precipitable water of the whole column, cm (g cm⁻²). */
  waterColumnCm: number
  /** Cloud fraction (cloudy skies unforced), default 0.6. */
  cloudFraction?: number
  /** Lapse rate, K km⁻¹, default 6.5. */
  lapseRateKPerKm?: number
  /** Leave the gases out (a transparent atmosphere; for checks). */
  transparentGases?: boolean
  /** Diffusivity factor of the two-stream, default 2 (hemispheric mean). */
  diffusivity?: number
}

export interface LongwaveForcingResult {
  /** TOA and surface infrared forcing, all-sky (clear-sky × (1 − cloud fraction)), W m⁻²; positive warms. */
  toaWm2: number
  surfaceWm2: number
  /** Infrared energy the layer's presence adds to the atmosphere (TOA − surface), W m⁻². */
  atmosphereWm2: number
  clearSkyToaWm2: number
  clearSkySurfaceWm2: number
  /** Clear-sky TOA forcing in each band, W m⁻². */
  bandToaWm2: number[]
  /** Outgoing infrared at the top over the bands without the layer, W m⁻² (clear sky). */
  outgoingWm2: number
  /** The layer's bottom, middle and top heights (km) and temperatures (K). */
  layerBottomKm: number
  layerTopKm: number
  layerTemperatureK: number
}

/** Air temperature at a height, K: the lapse rate up to the tropopause, constant above. */
export function airTemperatureK(surfaceK: number, heightKm: number, lapse = STANDARD_LAPSE_RATE_K_PER_KM): number {
  return surfaceK - lapse * Math.min(heightKm, TROPOPAUSE_KM)
}

/** The model's levels, km from the ground up: every km to the tropopause, then 15, 20, 30, 50, and the layer's faces. */
function levelsKm(bottom: number, top: number): number[] {
  const base = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 15, 20, 30, MODEL_TOP_KM, bottom, top]
  base.sort((a, b) => a - b)
  const out: number[] = []
  for (const z of base) if (!out.length || z - out[out.length - 1] > 1e-9) out.push(z)
  return out
}

/** The bands' edges, µm (the bands are contiguous: each band's upper edge is the next one's lower). */
const BAND_EDGES_UM: readonly number[] = Object.freeze([LONGWAVE_BANDS[0].loUm, ...LONGWAVE_BANDS.map((b, i) => {
  const next = LONGWAVE_BANDS[i + 1]
  if (next && next.loUm !== b.hiUm) throw new Error(`longwave bands ${b.loUm}–${b.hiUm} and ${next.loUm}–${next.hiUm} µm are not contiguous`)
  return b.hiUm
})])

/**
 * Each band's blackbody flux at a temperature (planckBandFluxes over BAND_EDGES_UM), kept per temperature: the
 * levels above the tropopause share theirs, and a map or an uncertainty run meets the same temperatures again.
 */
const emissionByTemperature = new Map<number, Float64Array>()
const EMISSIONS_KEPT = 1024

function bandEmissions(temperatureK: number): Float64Array {
  let e = emissionByTemperature.get(temperatureK)
  if (!e) {
    if (emissionByTemperature.size >= EMISSIONS_KEPT) emissionByTemperature.clear()
    e = planckBandFluxes(BAND_EDGES_UM, temperatureK, new Float64Array(LONGWAVE_BANDS.length))
    emissionByTemperature.set(temperatureK, e)
  }
  return e
}

/**
 * The aerosol-free atmosphere of the last call (its levels' band emission and each band's fluxes): an uncertainty
 * run or a map computes many layers in the same atmosphere, and these depend on the site and the layer's place only.
 */
let cleanKey = ''
let cleanEmission: number[][] = []
let cleanFluxes: { up: ArrayLike<number>; down: ArrayLike<number> }[] = []

/** The layer's infrared forcing; see the module note. */
export function longwaveForcing(input: LongwaveForcingInput): LongwaveForcingResult {
  const { bands, surfaceTemperatureK: ts, surfaceEmissivity: eps, layerHeightKm: h, waterColumnCm: w } = input
  checkLongwaveInput('surface_temperature_k', ts, 'surfaceTemperatureK')
  if (typeof eps === 'number') checkLongwaveInput('surface_emissivity', eps, 'surfaceEmissivity')
  else {
    if (eps.length !== LONGWAVE_BANDS.length) throw new InputError('surfaceEmissivity', `${eps.length} band emissivities were given`, `Give one emissivity, or one for each of the ${LONGWAVE_BANDS.length} infrared bands.`)
    eps.forEach((e, i) => checkLongwaveInput('surface_emissivity', e, `surfaceEmissivity[${i}]`))
  }
  const epsOf = (bi: number) => (typeof eps === 'number' ? eps : eps[bi])
  checkLongwaveInput('layer_height_km', h, 'layerHeightKm')
  checkLongwaveInput('water_column_cm', w, 'waterColumnCm')
  checkRange('layerDepthKm', input.layerDepthKm, 0, 1e6, 'km')
  const ac = input.cloudFraction ?? DEFAULT_CLOUD_FRACTION
  checkRange('cloudFraction', ac, 0, 1)
  const lapse = input.lapseRateKPerKm ?? STANDARD_LAPSE_RATE_K_PER_KM
  checkRange('lapseRateKPerKm', lapse, 0, 10, 'K km⁻¹')
  const D = input.diffusivity ?? HEMISPHERIC_MEAN_DIFFUSIVITY
  if (bands.length !== LONGWAVE_BANDS.length) throw new InputError('bands', `${bands.length} bands were given`, `Give the layer's optics in each of the ${LONGWAVE_BANDS.length} infrared bands.`)
  bands.forEach((b, i) => {
    checkRange(`bands[${i}].tau`, b.tau, 0, 1e3)
    checkRange(`bands[${i}].omega`, b.omega, 0, 1)
    checkRange(`bands[${i}].g`, b.g, -1, 1)
  })
  // the layer: centred on h, at least 1 m deep, never below the ground, at most 30 km deep
  const depth = Math.min(Math.max(input.layerDepthKm, 1e-3), 30)
  const bottom = Math.max(0, h - depth / 2)
  const top = bottom + depth
  const z = levelsKm(bottom, top)
  const nl = z.length - 1
  const temps = z.map((zz) => airTemperatureK(ts, zz, lapse))
  const gas = !input.transparentGases
  const waterBelow = (zz: number) => 1 - Math.exp(-zz / WATER_SCALE_HEIGHT_KM)
  const pressure = (zz: number) => Math.exp(-zz / PRESSURE_SCALE_HEIGHT_KM)
  const key = [ts, typeof eps === 'number' ? eps : eps.join(' '), h, w, lapse, D, bottom, top, input.transparentGases === true].join()
  const reuse = key === cleanKey
  if (!reuse) {
    cleanKey = ''
    cleanEmission = []
    cleanFluxes = []
  }
  const layersClean: ThermalLayer[] = new Array(nl)
  const layersWith: ThermalLayer[] = new Array(nl)
  const bandToa: number[] = []
  let toa = 0
  let sfc = 0
  let olr = 0
  const levelEmission = reuse ? [] : temps.map(bandEmissions)
  LONGWAVE_BANDS.forEach((band, bi) => {
    const emission = reuse ? cleanEmission[bi] : levelEmission.map((e) => e[bi])
    if (!reuse) cleanEmission[bi] = emission
    const a = bands[bi]
    for (let i = 0; i < nl; i++) {
      // layers from the top down: layer i spans z[nl − i − 1] (bottom) to z[nl − i] (top)
      const lo = z[nl - i - 1]
      const hi = z[nl - i]
      let fluxDepth = 0
      if (gas) {
        fluxDepth += band.waterPerCm * w * (waterBelow(hi) - waterBelow(lo))
        fluxDepth += band.mixedGasDepth * (pressure(lo) - pressure(hi))
        const o = Math.max(0, Math.min(hi, OZONE_KM[1]) - Math.max(lo, OZONE_KM[0]))
        fluxDepth += (band.ozoneDepth * o) / (OZONE_KM[1] - OZONE_KM[0])
      }
      const tauGas = fluxDepth / D
      const share = Math.max(0, Math.min(hi, top) - Math.max(lo, bottom)) / (top - bottom)
      const tauA = a.tau * share
      const tau = tauGas + tauA
      const emissionTop = emission[nl - i]
      const emissionBottom = emission[nl - i - 1]
      // the clean layers only where the clean fluxes are not kept from the last call; the layers of one band
      // serve the next (thermalTwoStream reads them during its call only)
      if (!reuse) layersClean[i] = { tau: tauGas, omega: 0, g: 0, emissionTop, emissionBottom }
      const L = (layersWith[i] ??= { tau: 0, omega: 0, g: 0, emissionTop: 0, emissionBottom: 0 })
      L.tau = tau
      L.omega = tau > 0 ? (a.omega * tauA) / tau : 0
      L.g = a.g
      L.emissionTop = emissionTop
      L.emissionBottom = emissionBottom
    }
    const surfaceEmission = emission[0]
    const clean = reuse ? cleanFluxes[bi] : thermalTwoStream({ layers: layersClean, surfaceEmissivity: epsOf(bi), surfaceEmission, diffusivity: D })
    if (!reuse) cleanFluxes[bi] = { up: clean.up, down: clean.down }
    const withLayer = thermalTwoStream({ layers: layersWith, surfaceEmissivity: epsOf(bi), surfaceEmission, diffusivity: D })
    const dToa = clean.up[0] - withLayer.up[0]
    const dSfc = withLayer.down[nl] - withLayer.up[nl] - (clean.down[nl] - clean.up[nl])
    bandToa.push(dToa)
    toa += dToa
    sfc += dSfc
    olr += clean.up[0]
  })
  cleanKey = key
  const clear = 1 - ac
  return {
    toaWm2: toa * clear,
    surfaceWm2: sfc * clear,
    atmosphereWm2: (toa - sfc) * clear,
    clearSkyToaWm2: toa,
    clearSkySurfaceWm2: sfc,
    bandToaWm2: bandToa,
    outgoingWm2: olr,
    layerBottomKm: bottom,
    layerTopKm: top,
    layerTemperatureK: airTemperatureK(ts, (bottom + top) / 2, lapse)
  }
}

/** The method in words, for reports and result notes. */
export const LONGWAVE_METHOD =
  'Infrared part: the layer in a model atmosphere (lapse rate 6.5 K/km to an 11 km tropopause; water vapour with a 2 km scale height; ' +
  'stated grey band transmittances for water vapour, CO₂ and ozone) over a surface of the given temperature and emissivity, in 12 bands ' +
  'from 4 to 40 µm, by the hemispheric-mean two-stream with thermal emission (Toon et al. 1989); cloudy skies unforced. ' +
  'Left out: wavelengths beyond 40 µm and below 4 µm, the gases’ line structure, the layer’s own heating, and feedbacks.'
