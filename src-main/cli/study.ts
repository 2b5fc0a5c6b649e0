// motebench study FILE.mote: every sample's bulk optics, derived figures, forcing and verdict.
import { evaluateStudy, FORCING_CAUTION, sampleWarnings, withheldText, type SampleResult, type Study } from '../../src-core/index.ts'
import { loadStudyFile, saveTextAtomically } from '../files.ts'
import { csvLine, findSample, formatNumber, readArgs, readTolerance, UsageError } from './common.ts'

export const studyHelp = `motebench study FILE.mote: evaluates a study: every sample's optics at every wavelength, its figures and forcing
  FILE                  a study file (.mote); "motebench demo" writes an example
  --format F            text (default), json or csv (one row per sample and wavelength, units in the column names);
                        a figure with no meaning (absorption Ångström exponent of too little absorption, visual range
                        and haze index outside 400–700 nm or below the haze scale's zero) is — in text, empty in
                        CSV and null in JSON, its reason in the withheld column / field
  --json                the same as --format json
  --out FILE            write to FILE (complete or not at all) instead of standard output
  --sample NAME         only this sample (repeat for more)
  --tolerance T         relative accuracy of the size integration (default 1e-4)
Each sample's warnings (figures outside their method's range) are printed under it, listed as "warnings" in the
JSON (per sample) and joined by " | " in the CSV's last column, "warnings" (empty when there is nothing to say).
Exit status 0, or 2 when the study has problems (each is listed with its place and fix).`

/** CSV columns: per-wavelength figures, then the sample's figures, then its forcing (repeated on each of its rows). */
const WAVELENGTH_COLUMNS = [
  'wavelength_nm',
  'ext_Mm-1',
  'sca_Mm-1',
  'abs_Mm-1',
  'ssa',
  'g',
  'backscatter_fraction',
  'upscatter_fraction',
  'mass_ext_dry_m2_g-1',
  'mass_sca_dry_m2_g-1',
  'mass_abs_dry_m2_g-1',
  'mass_ext_wet_m2_g-1',
  'mass_sca_wet_m2_g-1',
  'mass_abs_wet_m2_g-1',
  'angstrom_ext',
  'angstrom_abs',
  'optical_depth',
  'rayleigh_sca_sea_level_Mm-1',
  'visual_range_km',
  'haze_index_dv',
  'withheld'
]
const SAMPLE_COLUMNS = [
  'number_cm-3',
  'surface_um2_cm-3',
  'dry_volume_um3_cm-3',
  'dry_mass_ug_m-3',
  'wet_volume_um3_cm-3',
  'wet_mass_ug_m-3',
  'pm1_ug_m-3',
  'pm2_5_ug_m-3',
  'pm10_ug_m-3',
  'angstrom_ext',
  'angstrom_sca',
  'angstrom_abs',
  'layer_depth_m',
  'angstrom_abs_withheld'
]
const FORCING_COLUMNS = [
  'tau_550',
  'ssa_550',
  'g_550',
  'upscatter_550',
  'surface_albedo',
  'thin_layer_forcing_W_m-2',
  'forcing_efficiency_W_m-2_per_tau',
  'critical_ssa',
  'flip_surface_albedo',
  'spectral_forcing_W_m-2',
  'daily_mean_forcing_W_m-2',
  'daily_insolation_W_m-2',
  'two_stream_toa_W_m-2',
  'two_stream_surface_W_m-2',
  'two_stream_atmosphere_W_m-2',
  'verdict',
  'verdict_margin_W_m-2',
  'longwave_toa_W_m-2',
  'longwave_surface_W_m-2',
  'net_toa_W_m-2',
  'sunlight_verdict',
  'dominant_part'
]
/** The last column: the sample's warnings (figures outside their method's range), joined by " | "; empty when none. */
const WARNINGS_COLUMN = 'warnings'

export function studyCsv(results: SampleResult[]): string {
  let text = csvLine(['sample', ...WAVELENGTH_COLUMNS, ...SAMPLE_COLUMNS, ...FORCING_COLUMNS, WARNINGS_COLUMN])
  for (const r of results) {
    const { optics: o, forcing: f } = r
    const warnings = sampleWarnings(r).join(' | ')
    const sampleCells = [
      o.number_cm3,
      o.surface_um2_cm3,
      o.volume_um3_cm3,
      o.mass_ug_m3,
      o.wet_volume_um3_cm3,
      o.wet_mass_ug_m3,
      o.pm1_ug_m3,
      o.pm2_5_ug_m3,
      o.pm10_ug_m3,
      o.angstrom_fit.ext,
      o.angstrom_fit.sca,
      o.angstrom_fit.abs,
      o.layer_depth_m,
      o.angstrom_fit.withheld?.abs ?? ''
    ]
    const t = f.two_stream
    const forcingCells = [
      f.tau_550,
      f.ssa_550,
      f.g_550,
      f.upscatter_550,
      f.surface_albedo,
      f.thin_layer_w_m2,
      f.efficiency_w_m2_per_tau,
      f.critical_ssa,
      f.flip_surface_albedo,
      f.spectral_w_m2,
      f.daily_mean_w_m2,
      f.insolation_w_m2,
      t.toa_w_m2,
      t.surface_w_m2,
      t.atmosphere_w_m2,
      f.verdict,
      f.margin_w_m2,
      f.longwave_toa_w_m2 ?? '',
      f.longwave_surface_w_m2 ?? '',
      f.net_toa_w_m2,
      f.sunlight_verdict,
      f.dominant
    ]
    for (const w of o.wavelengths) {
      const cells = [
        w.wavelength_nm,
        w.ext,
        w.sca,
        w.abs,
        w.ssa,
        w.g,
        w.backscatter_fraction,
        w.upscatter_fraction,
        w.mass_ext_dry,
        w.mass_sca_dry,
        w.mass_abs_dry,
        w.mass_ext_wet,
        w.mass_sca_wet,
        w.mass_abs_wet,
        w.angstrom_ext,
        w.angstrom_abs,
        w.optical_depth,
        w.rayleigh_sca,
        w.visual_range_km,
        w.deciview,
        withheldText(w)
      ]
      text += csvLine([o.name, ...cells, ...sampleCells, ...forcingCells, warnings])
    }
  }
  return text
}

function studyJson(file: string, study: Study, results: SampleResult[], version: string, warnings: string[]): string {
  const body = {
    file,
    study: study.name,
    version,
    wavelengths_nm: study.wavelengths_nm,
    site: study.site,
    warnings,
    samples: results.map((r) => ({ name: r.optics.name, warnings: sampleWarnings(r), optics: r.optics, forcing: r.forcing, humidity_growth: r.humidity })),
    caution: FORCING_CAUTION
  }
  return JSON.stringify(body, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2) + '\n'
}

function studyText(study: Study, results: SampleResult[]): string {
  const lines: string[] = []
  const f = (v: number) => (Number.isNaN(v) ? '—' : formatNumber(v))
  lines.push(`${study.name}: ${results.length} sample${results.length === 1 ? '' : 's'}, site ${study.site.name ?? 'unnamed'}`)
  for (const r of results) {
    const { optics: o, forcing: fc } = r
    lines.push('', `${o.name}`)
    const rows: (string | number)[][] = [['λ nm', 'ext Mm⁻¹', 'sca Mm⁻¹', 'abs Mm⁻¹', 'ssa', 'g', 'upscatter', 'optical depth', 'visual range km']]
    for (const w of o.wavelengths) rows.push([w.wavelength_nm, w.ext, w.sca, w.abs, w.ssa, w.g, w.upscatter_fraction, w.optical_depth, w.visual_range_km])
    const cells = rows.map((r) => r.map((c) => (typeof c === 'number' ? f(c) : c)))
    const widths = cells[0].map((_, j) => Math.max(...cells.map((r) => r[j].length)))
    for (const r of cells) lines.push('  ' + r.map((c, j) => c.padEnd(widths[j])).join('  ').trimEnd())
    for (const w of o.wavelengths) if (withheldText(w)) lines.push(`  not given at ${w.wavelength_nm} nm (no meaning there): ${withheldText(w)}`)
    if (o.angstrom_fit.withheld?.abs) lines.push(`  absorption Ångström exponent not given: ${o.angstrom_fit.withheld.abs}`)
    lines.push(`  dry number ${f(o.number_cm3)} cm⁻³, dry mass ${f(o.mass_ug_m3)} µg/m³, PM2.5 ${f(o.pm2_5_ug_m3)} µg/m³; Ångström exponents ext ${f(o.angstrom_fit.ext)}, sca ${f(o.angstrom_fit.sca)}, abs ${f(o.angstrom_fit.abs)}`)
    lines.push(`  forcing: ${fc.verdict}; thin-layer ${f(fc.thin_layer_w_m2)} W/m², spectral ${f(fc.spectral_w_m2)} W/m², site daily mean ${f(fc.daily_mean_w_m2)} W/m², two-stream ${f(fc.two_stream.toa_w_m2)} W/m²`)
    if (fc.longwave_toa_w_m2 !== null) lines.push(`  infrared: top of atmosphere ${f(fc.longwave_toa_w_m2)} W/m², surface ${f(fc.longwave_surface_w_m2 ?? NaN)} W/m²; net ${f(fc.net_toa_w_m2)} W/m² (sunlight part ${fc.sunlight_verdict})`)
    lines.push(`  ${fc.explanation}`)
    for (const w of sampleWarnings(r)) lines.push(`  warning: ${w}`)
  }
  lines.push('', FORCING_CAUTION)
  return lines.join('\n') + '\n'
}

export async function runStudy(argv: string[]): Promise<number> {
  const { values, positionals } = readArgs(
    'study',
    argv,
    {
      format: { type: 'string' },
      json: { type: 'boolean', default: false },
      out: { type: 'string' },
      sample: { type: 'string', multiple: true },
      tolerance: { type: 'string' }
    },
    true
  )
  if (positionals.length !== 1) throw new UsageError('study: give one study file, for example "motebench study demo.mote"')
  const format = values.format ?? (values.json ? 'json' : 'text')
  if (!['text', 'json', 'csv'].includes(format)) throw new UsageError(`study: --format "${values.format}" is not text, json or csv`)
  if (values.json && format !== 'json') throw new UsageError('study: --json and --format csv/text contradict each other; give one')
  const tolerance = readTolerance(values.tolerance, 1e-4)
  const file = positionals[0]
  const loaded = await loadStudyFile(file)
  for (const w of loaded.warnings) process.stderr.write(`motebench: warning: ${w}\n`)
  const study = loaded.study
  const sampleIndices = values.sample !== undefined ? [...new Set(values.sample.map((name) => findSample(study, name, 'study').index))] : undefined
  const tty = process.stderr.isTTY
  const results = evaluateStudy(study, {
    tolerance,
    sampleIndices,
    progress: tty ? (done, total) => void process.stderr.write(`\r\x1b[Kevaluated ${done} of ${total} samples`) : undefined
  })
  if (tty) process.stderr.write('\r\x1b[K')
  const text =
    format === 'json' ? studyJson(file, study, results.samples, results.version, loaded.warnings) : format === 'csv' ? studyCsv(results.samples) : studyText(study, results.samples)
  if (values.out !== undefined) {
    await saveTextAtomically(values.out, text, { backup: false, force: true })
    process.stderr.write(`wrote ${values.out}\n`)
  } else process.stdout.write(text)
  return 0
}
