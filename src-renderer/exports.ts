// Results as CSV and JSON files (the numbers exactly as computed; no new physics).
import { sampleWarnings, withheldText, type SampleResult, type Study } from '../src-core/index.ts'
import { ESTIMATE_CAUTION, HEALTH_CAUTIONS } from './cautions.ts'
import { PREVIEW_TOLERANCE } from './compute/messages.ts'

export const APP_VERSION = typeof __APP_VERSION__ === 'string' ? __APP_VERSION__ : 'dev'

const WAVELENGTH_COLUMNS: [string, (w: SampleResult['optics']['wavelengths'][number]) => number | string][] = [
  ['wavelength_nm', (w) => w.wavelength_nm],
  ['ext_Mm-1', (w) => w.ext],
  ['sca_Mm-1', (w) => w.sca],
  ['abs_Mm-1', (w) => w.abs],
  ['ssa', (w) => w.ssa],
  ['g', (w) => w.g],
  ['backscatter_fraction', (w) => w.backscatter_fraction],
  ['upscatter_fraction', (w) => w.upscatter_fraction],
  ['mass_ext_dry_m2_g-1', (w) => w.mass_ext_dry],
  ['mass_sca_dry_m2_g-1', (w) => w.mass_sca_dry],
  ['mass_abs_dry_m2_g-1', (w) => w.mass_abs_dry],
  ['mass_ext_wet_m2_g-1', (w) => w.mass_ext_wet],
  ['mass_sca_wet_m2_g-1', (w) => w.mass_sca_wet],
  ['mass_abs_wet_m2_g-1', (w) => w.mass_abs_wet],
  ['angstrom_ext', (w) => w.angstrom_ext],
  ['angstrom_abs', (w) => w.angstrom_abs],
  ['optical_depth', (w) => w.optical_depth],
  ['visual_range_km', (w) => w.visual_range_km],
  ['deciview', (w) => w.deciview],
  ['withheld', (w) => withheldText(w)]
]

/**
 * How an exported sample's figures relate to its inputs as they stand: computed from them ('current'), the quick
 * first pass of a computation still running or stopped ('quick', to PREVIEW_TOLERANCE), or from inputs
 * that have since changed or cannot be read ('out-of-date'). Exported figures always carry it.
 */
export type ResultStatus = 'current' | 'quick' | 'out-of-date'

export interface ExportedResult {
  result: SampleResult
  status: ResultStatus
}

const STATUS_WORDS: Record<Exclude<ResultStatus, 'current'>, string> = {
  quick: `quick figures (to about ${PREVIEW_TOLERANCE * 100} % of σext, still being refined)`,
  'out-of-date': 'out of date (computed before the inputs last changed)'
}

/** One line per sample whose exported figures are not from its current inputs; empty when all are. */
export function statusLines(study: Study, results: (ExportedResult | undefined)[]): string[] {
  return study.samples.flatMap((s, i) => {
    const st = results[i]?.status
    return st && st !== 'current' ? [`“${s.name}”: ${STATUS_WORDS[st]}`] : []
  })
}

function csvCell(v: string | number): string {
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : ''
  return /[",\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v
}

/** One row per sample and wavelength, then one row per sample with the forcing summary. */
export function resultsCsv(study: Study, results: (ExportedResult | undefined)[]): string {
  const rows: (string | number)[][] = [['sample', 'status', ...WAVELENGTH_COLUMNS.map(([h]) => h)]]
  study.samples.forEach((s, i) => {
    const x = results[i]
    for (const w of x?.result.optics.wavelengths ?? []) rows.push([s.name, x!.status, ...WAVELENGTH_COLUMNS.map(([, f]) => f(w))])
  })
  rows.push([])
  rows.push([
    'sample',
    'status',
    'verdict',
    'thin_layer_W_m-2',
    'spectral_W_m-2',
    'daily_mean_W_m-2',
    'two_stream_toa_W_m-2',
    'two_stream_surface_W_m-2',
    'two_stream_atmosphere_W_m-2',
    'efficiency_W_m-2_per_tau',
    'tau_550',
    'ssa_550',
    'critical_ssa',
    'g_550',
    'surface_albedo',
    'flip_surface_albedo',
    'angstrom_ext',
    'angstrom_sca',
    'angstrom_abs',
    'angstrom_abs_withheld',
    'number_cm-3',
    'mass_ug_m-3',
    'pm2_5_ug_m-3',
    'longwave_toa_W_m-2',
    'longwave_surface_W_m-2',
    'net_toa_W_m-2',
    'sunlight_verdict',
    'dominant_part'
  ])
  study.samples.forEach((s, i) => {
    const x = results[i]
    if (!x) return
    const r = x.result
    const f = r.forcing
    rows.push([
      s.name,
      x.status,
      f.verdict,
      f.thin_layer_w_m2,
      f.spectral_w_m2,
      f.daily_mean_w_m2,
      f.two_stream.toa_w_m2,
      f.two_stream.surface_w_m2,
      f.two_stream.atmosphere_w_m2,
      f.efficiency_w_m2_per_tau,
      f.tau_550,
      f.ssa_550,
      f.critical_ssa,
      f.g_550,
      f.surface_albedo,
      f.flip_surface_albedo ?? '',
      r.optics.angstrom_fit.ext,
      r.optics.angstrom_fit.sca,
      r.optics.angstrom_fit.abs,
      r.optics.angstrom_fit.withheld?.abs ?? '',
      r.optics.number_cm3,
      r.optics.mass_ug_m3,
      r.optics.pm2_5_ug_m3,
      f.longwave_toa_w_m2 ?? '',
      f.longwave_surface_w_m2 ?? '',
      f.net_toa_w_m2,
      f.sunlight_verdict,
      f.dominant
    ])
  })
  rows.push([])
  for (const line of statusLines(study, results)) rows.push([`# Not from the current inputs: ${line}`])
  study.samples.forEach((s, i) => {
    const x = results[i]
    for (const w of x ? sampleWarnings(x.result) : []) rows.push([`# Warning, “${s.name}”: ${w}`])
  })
  rows.push([`# ${ESTIMATE_CAUTION}`])
  rows.push([`# Motebench ${APP_VERSION}; study "${study.name}"`])
  return rows.map((r) => r.map(csvCell).join(',')).join('\n') + '\n'
}

export function resultsJson(study: Study, results: (ExportedResult | undefined)[]): string {
  return (
    JSON.stringify(
      {
        software: { name: 'Motebench', version: APP_VERSION },
        cautions: { estimate: ESTIMATE_CAUTION, health: HEALTH_CAUTIONS },
        study,
        results: study.samples.map((s, i) => {
          const x = results[i]
          return x ? { sample: s.name, status: x.status, ...x.result } : { sample: s.name, missing: 'no result (input problems)' }
        })
      },
      null,
      2
    ) + '\n'
  )
}
