// motebench forcing: direct-forcing estimate of a uniform aerosol layer from its optical figures.
import { CUSTOM_SURFACE_EMISSIVITY, DEFAULT_LAYER_HEIGHT_KM, DEFAULT_SURFACE_TEMPERATURE_K, DEFAULT_WATER_COLUMN_CM, forcingVerdict, InputError, LONGWAVE_BANDS, LONGWAVE_METHOD, longwaveForcing, netVerdict, SOLAR_CONSTANT_WM2, thinLayerCheck, thinLayerForcing, twoStreamEquivalentUpscatter, twoStreamForcing } from '../../src-core/index.ts'
import { need, printJson, readArgs, readNumber, UsageError } from './common.ts'

/** The bands' edges in words, for the help: "4–5.5, 5.5–7.5, …". */
const BAND_LIST = LONGWAVE_BANDS.map((b) => `${b.loUm}–${b.hiUm}`).join(', ')

export const forcingHelp = `motebench forcing: global-mean direct forcing of a uniform aerosol layer, and whether it cools or warms
  --tau T               optical depth of the layer (at 550 nm), 0 to 10
  --ssa W               single-scattering albedo ω, 0 to 1
  --upscatter B         mean upscatter fraction β̄, 0 to 1 (thin-layer estimate, Chylek & Wong 1995); with
                        --two-stream optional: the layer then scatters that share upward too, so that both
                        methods assume the same scattering (without it, the delta-Eddington phase function's own)
  --surface-albedo R    surface albedo, 0 to 1
  --cloud C             cloud fraction (the cloudy part is taken as unforced), default 0.6
  --transmittance T     one-way transmittance of the air above the layer, default 0.76
  --two-stream          use the delta-Eddington two-stream layer instead (needs --g; incident flux S₀/4)
  --g G                 asymmetry parameter, 0 to 0.99 (needed with --two-stream; for the thin-layer estimate it only
                        sets the two-stream layer it is checked against, default the g that implies β̄)
  --cos-zenith M        cosine of the sun's zenith angle for --two-stream, default 0.5
  --margin M            |forcing| below M W m⁻² is "too close to call", default 0.5
  --json                JSON output: method, forcing_w_m2, efficiency_w_m2_per_tau, critical_ssa, verdict, upscatter
                        and upscatter_source (the scattering the method assumed), warnings, caution (and toa_w_m2,
                        surface_w_m2, atmosphere_w_m2 with --two-stream; two_stream_w_m2 without)
Thermal infrared (the layer's infrared part, added to the sunlight figure for the net verdict):
  --ir-tau T            the layer's infrared optical depth, 0 to 1000: one value, the same in every band, or
                        ${LONGWAVE_BANDS.length} comma-separated values, one per band in this order (µm):
                        ${BAND_LIST}
  --ir-ssa W            its infrared single-scattering albedo, 0 to 1 (needed with --ir-tau); one value or ${LONGWAVE_BANDS.length}
  --ir-g G              its infrared asymmetry parameter, −1 to 1, default 0.5; one value or ${LONGWAVE_BANDS.length}
  --surface-temperature K   surface temperature in kelvin, 180 to 350, default ${DEFAULT_SURFACE_TEMPERATURE_K}
  --emissivity E        surface infrared emissivity, 0.5 to 1, default ${CUSTOM_SURFACE_EMISSIVITY}
  --layer-height KM     height of the layer's middle above the ground, km, 0 to 15, default ${DEFAULT_LAYER_HEIGHT_KM}
  --layer-depth KM      depth of the layer, km, default 1
  --water-column CM     precipitable water of the column, cm, 0 to 10, default ${DEFAULT_WATER_COLUMN_CM}
  With --ir-tau the JSON adds longwave_toa_w_m2, longwave_surface_w_m2, net_toa_w_m2 (forcing_w_m2 plus
  longwave_toa_w_m2), sunlight_verdict, dominant and longwave_inputs (ir_tau, ir_ssa, ir_g as given: a number, or
  a list of one per band, and longwave_bands: each band's lo_um, hi_um, tau, ssa, g as used), and verdict is the
  net's.
A negative forcing cools. The thin-layer estimate is checked against the two-stream layer with the same β̄: where
they differ by more than 10 % it carries a warning. This is a first-order screening estimate, not a climate projection.`

/** The core's parameter names as the options a person typed. */
const FLAG_OF: Record<string, string> = {
  tau: '--tau',
  omega: '--ssa',
  upscatter: '--upscatter',
  surfaceAlbedo: '--surface-albedo',
  cloudFraction: '--cloud',
  transmittance: '--transmittance',
  asymmetry: '--g',
  cosZenith: '--cos-zenith',
  marginWm2: '--margin',
  surfaceTemperatureK: '--surface-temperature',
  surfaceEmissivity: '--emissivity',
  layerHeightKm: '--layer-height',
  layerDepthKm: '--layer-depth',
  waterColumnCm: '--water-column',
}

/** The option a band's figure came from, with the band where several were given: bands[3].tau → --ir-tau (band 4, 8.5–9.5 µm). */
const BAND_FLAG: Record<string, string> = { tau: '--ir-tau', omega: '--ir-ssa', g: '--ir-g' }
let perBand: Record<string, boolean> = {}

function flagOf(where: string): string | undefined {
  if (FLAG_OF[where]) return FLAG_OF[where]
  const m = /^bands\[(\d+)\]\.(tau|omega|g)$/.exec(where)
  if (!m) return undefined
  const b = LONGWAVE_BANDS[Number(m[1])]
  return perBand[m[2]] ? `${BAND_FLAG[m[2]]} (band ${Number(m[1]) + 1}, ${b.loUm}–${b.hiUm} µm)` : BAND_FLAG[m[2]]
}

export function runForcing(argv: string[]): number {
  try {
    return forcing(argv)
  } catch (e) {
    const flag = e instanceof InputError ? flagOf(e.where) : undefined
    if (e instanceof InputError && flag) {
      let problem = e.message.slice(e.where.length + 2)
      if (problem.endsWith(`. ${e.fix}`)) problem = problem.slice(0, -(e.fix.length + 2))
      throw new InputError(flag, problem, e.fix)
    }
    throw e
  }
}

function forcing(argv: string[]): number {
  const { values } = readArgs('forcing', argv, {
    tau: { type: 'string' },
    ssa: { type: 'string' },
    upscatter: { type: 'string' },
    'surface-albedo': { type: 'string' },
    cloud: { type: 'string' },
    transmittance: { type: 'string' },
    g: { type: 'string' },
    'two-stream': { type: 'boolean', default: false },
    'cos-zenith': { type: 'string' },
    margin: { type: 'string' },
    'ir-tau': { type: 'string' },
    'ir-ssa': { type: 'string' },
    'ir-g': { type: 'string' },
    'surface-temperature': { type: 'string' },
    emissivity: { type: 'string' },
    'layer-height': { type: 'string' },
    'layer-depth': { type: 'string' },
    'water-column': { type: 'string' },
    json: { type: 'boolean', default: false }
  })
  const tau = readNumber(need(values.tau, 'forcing', '--tau', '--tau 0.2'), '--tau')
  const omega = readNumber(need(values.ssa, 'forcing', '--ssa', '--ssa 0.92'), '--ssa')
  const surfaceAlbedo = readNumber(need(values['surface-albedo'], 'forcing', '--surface-albedo', '--surface-albedo 0.15'), '--surface-albedo')
  const cloudFraction = readNumber(values.cloud, '--cloud', 0.6)
  const transmittance = readNumber(values.transmittance, '--transmittance', 0.76)
  const marginWm2 = readNumber(values.margin, '--margin', 0.5)
  const twoStream = values['two-stream']
  const common = { cloudFraction, transmittance }
  if (!twoStream && values['cos-zenith'] !== undefined) throw new UsageError('forcing: --cos-zenith applies to --two-stream only')
  let result: Record<string, unknown>
  if (!twoStream) {
    const upscatter = readNumber(need(values.upscatter, 'forcing', '--upscatter', '--upscatter 0.24 (or --two-stream with --g)'), '--upscatter')
    const asymmetry = values.g === undefined ? undefined : readNumber(values.g, '--g')
    const thin = thinLayerForcing({ tau, omega, upscatter, surfaceAlbedo, ...common })
    const v = forcingVerdict({ tau, omega, upscatter, surfaceAlbedo, ...common, marginWm2, method: 'thin-layer' })
    const check = thinLayerCheck({ tau, omega, upscatter, surfaceAlbedo, asymmetry, ...common, marginWm2 })
    result = {
      method: 'thin-layer',
      forcing_w_m2: thin.forcingWm2,
      efficiency_w_m2_per_tau: thin.efficiencyWm2PerTau,
      critical_ssa: thin.omegaCritical,
      flip_surface_albedo: thin.flipSurfaceAlbedo,
      verdict: v.verdict,
      margin_w_m2: v.marginWm2,
      upscatter,
      upscatter_source: 'given (--upscatter)',
      two_stream_w_m2: check.twoStreamWm2,
      explanation: v.explanation,
      warnings: check.warning ? [`${check.warning} For it: motebench forcing --two-stream --g G --upscatter ${upscatter} (g = ${Number(check.asymmetry.toPrecision(3))} implies this β̄; give the layer's own).`] : [],
      caution: v.caution
    }
  } else {
    const asymmetry = readNumber(need(values.g, 'forcing', '--g', '--g 0.65 (the asymmetry parameter, with --two-stream)'), '--g')
    const cosZenith = readNumber(values['cos-zenith'], '--cos-zenith', 0.5)
    const upscatter = values.upscatter === undefined ? undefined : readNumber(values.upscatter, '--upscatter')
    const two = twoStreamForcing({ tau, omega, asymmetry, upscatter, cosZenith, surfaceAlbedo, incidentFluxWm2: SOLAR_CONSTANT_WM2 / 4, ...common })
    const v = forcingVerdict({ tau, omega, asymmetry, upscatter, cosZenith, surfaceAlbedo, ...common, marginWm2, method: 'two-stream' })
    result = {
      method: 'two-stream',
      upscatter: upscatter ?? twoStreamEquivalentUpscatter(asymmetry, cosZenith),
      upscatter_source: upscatter === undefined ? `delta-Eddington phase function with g = ${asymmetry} at μ₀ = ${cosZenith} (thin limit)` : 'given (--upscatter)',
      forcing_w_m2: two.toaWm2,
      efficiency_w_m2_per_tau: tau > 0 ? two.toaWm2 / tau : null,
      critical_ssa: v.omegaCritical,
      flip_surface_albedo: v.flipSurfaceAlbedo,
      toa_w_m2: two.toaWm2,
      surface_w_m2: two.surfaceWm2,
      atmosphere_w_m2: two.atmosphereWm2,
      verdict: v.verdict,
      margin_w_m2: v.marginWm2,
      explanation: v.explanation,
      warnings: [],
      caution: v.caution
    }
  }
  const ir = infraredPart(values, cloudFraction)
  if (ir) {
    const net = netVerdict({ sunlightWm2: result.forcing_w_m2 as number, infraredWm2: ir.toa, marginWm2 })
    result.sunlight_verdict = result.verdict
    result.verdict = net.verdict
    result.longwave_toa_w_m2 = ir.toa
    result.longwave_surface_w_m2 = ir.surface
    result.net_toa_w_m2 = net.netWm2
    result.dominant = net.dominant
    result.longwave_inputs = ir.inputs
    result.explanation = `Sunlight part: ${result.explanation as string} ${net.explanation}`
    result.longwave_method = LONGWAVE_METHOD
  }
  if (values.json) {
    printJson(result)
    return 0
  }
  const f = (x: unknown) => (typeof x === 'number' ? Number(x.toPrecision(4)).toString() : String(x))
  const out = process.stdout
  out.write(`verdict: ${result.verdict}\n`)
  out.write(`forcing ${f(result.forcing_w_m2)} W/m² (${result.method === 'two-stream' ? 'delta-Eddington two-stream, top of atmosphere' : 'thin-layer estimate, Chylek & Wong 1995'}), efficiency ${f(result.efficiency_w_m2_per_tau)} W/m² per unit τ\n`)
  if (twoStream) out.write(`surface ${f(result.surface_w_m2)} W/m², absorbed in the layer ${f(result.atmosphere_w_m2)} W/m²\n`)
  out.write(`critical single-scattering albedo ${f(result.critical_ssa)} (the layer cools above it)\n`)
  out.write(`upscatter fraction ${f(result.upscatter)}: ${result.upscatter_source}\n`)
  if (!twoStream) out.write(`two-stream layer with the same upscatter: ${f(result.two_stream_w_m2)} W/m²\n`)
  if (ir) out.write(`infrared: top of atmosphere ${f(result.longwave_toa_w_m2)} W/m², surface ${f(result.longwave_surface_w_m2)} W/m²; net ${f(result.net_toa_w_m2)} W/m² (sunlight part: ${result.sunlight_verdict})\n`)
  out.write(`${result.explanation}\n`)
  for (const w of result.warnings as string[]) out.write(`warning: ${w}\n`)
  out.write(`${result.caution}\n`)
  return 0
}

type ForcingValues = Record<string, string | boolean | undefined>

/** The layer's infrared part from the --ir-* and site options, or null without --ir-tau. */
function infraredPart(values: ForcingValues, cloudFraction: number): { toa: number; surface: number; inputs: Record<string, unknown> } | null {
  const str = (k: string) => (typeof values[k] === 'string' ? (values[k] as string) : undefined)
  const site = ['ir-ssa', 'ir-g', 'surface-temperature', 'emissivity', 'layer-height', 'layer-depth', 'water-column']
  if (str('ir-tau') === undefined) {
    const stray = site.find((k) => str(k) !== undefined)
    if (stray) throw new UsageError(`forcing: --${stray} applies to the infrared part only; give --ir-tau (and --ir-ssa) too`)
    return null
  }
  const tau = readBandValues(str('ir-tau')!, '--ir-tau')
  const omega = readBandValues(need(str('ir-ssa'), 'forcing', '--ir-ssa', '--ir-ssa 0.5 (the infrared single-scattering albedo, with --ir-tau)'), '--ir-ssa')
  const g = readBandValues(str('ir-g') ?? '0.5', '--ir-g')
  perBand = { tau: tau.length > 1, omega: omega.length > 1, g: g.length > 1 }
  const at = (v: number[], i: number) => (v.length > 1 ? v[i] : v[0])
  const bands = LONGWAVE_BANDS.map((_, i) => ({ tau: at(tau, i), omega: at(omega, i), g: at(g, i) }))
  const inputs = {
    ir_tau: tau.length > 1 ? tau : tau[0],
    ir_ssa: omega.length > 1 ? omega : omega[0],
    ir_g: g.length > 1 ? g : g[0],
    surface_temperature_k: readNumber(str('surface-temperature'), '--surface-temperature', DEFAULT_SURFACE_TEMPERATURE_K),
    surface_emissivity: readNumber(str('emissivity'), '--emissivity', CUSTOM_SURFACE_EMISSIVITY),
    layer_height_km: readNumber(str('layer-height'), '--layer-height', DEFAULT_LAYER_HEIGHT_KM),
    layer_depth_km: readNumber(str('layer-depth'), '--layer-depth', 1),
    water_column_cm: readNumber(str('water-column'), '--water-column', DEFAULT_WATER_COLUMN_CM),
    longwave_bands: LONGWAVE_BANDS.map((b, i) => ({ lo_um: b.loUm, hi_um: b.hiUm, tau: bands[i].tau, ssa: bands[i].omega, g: bands[i].g }))
  }
  const r = longwaveForcing({
    bands,
    surfaceTemperatureK: inputs.surface_temperature_k,
    surfaceEmissivity: inputs.surface_emissivity,
    layerHeightKm: inputs.layer_height_km,
    layerDepthKm: inputs.layer_depth_km,
    waterColumnCm: inputs.water_column_cm,
    cloudFraction
  })
  return { toa: r.toaWm2, surface: r.surfaceWm2, inputs }
}

/** One number (the same in every band) or one per band, comma-separated, for an --ir-* option. */
function readBandValues(text: string, flag: string): number[] {
  const parts = text.split(',')
  if (parts.length !== 1 && parts.length !== LONGWAVE_BANDS.length) {
    throw new UsageError(
      `forcing: ${flag} takes one value (the same in every band) or ${LONGWAVE_BANDS.length}, one per band, not ${parts.length} ("${text}"); the bands in order are ${BAND_LIST} µm`
    )
  }
  return parts.map((p, i) => readNumber(p.trim(), parts.length > 1 ? `${flag} (value ${i + 1} of ${parts.length})` : flag))
}
