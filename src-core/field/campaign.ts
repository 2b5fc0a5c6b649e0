/**
 * A campaign's record: the station's files turned into one row per time step, as `motebench merge` and
 * `motebench series` make it, but in memory for the app. Several sizers are merged (planMerge, mergeStep) on a
 * regular time base (TimeAverager), their values rounded as the merged file writes them, so that the record is
 * what `series` gives on the file `merge` writes; one sizer (or an already merged file) is taken row by row as
 * `series` takes it. The figures come from the bin kernels (binnedRowEvaluator: the bins are the same on every
 * row), the measured coefficients are averaged onto the rows (MeasuredAlignment) and compared (RowComparer).
 *
 * A step without a full distribution is a gap: `present[k]` is 0, its reason is in `gaps`, and the columns
 * the charts read (`recordColumn`) give null there, never a number.
 *
 * The app asks for the figures at the wavelengths its charts draw only (`figures: 'charts'`, chartWavelengthsNm):
 * the other wavelengths' columns stay empty until `completeRecord` fills them (the CSV export does), with the same
 * kernels and the same arithmetic, so the same numbers as a record computed whole.
 */
import { InputError } from '../errors.ts'
import { binCount, binnedRowEvaluator, binnedRowWidth, binOpticsKernels, type BinKernels, type BinLayout } from '../optics/binKernels.ts'
import { OpticsWorkspace } from '../optics/workspace.ts'
import type { Sample, Study } from '../study/model.ts'
import { campaignProblems, isSizerKind, type CampaignFileKind, type CampaignSettings } from './campaign-settings.ts'
import { readCampaignInstrument, readCampaignSizer, type CampaignFileSummary, type CampaignInput, type ReadInstrument, type ReadSizer, type SizerPart } from './campaign-read.ts'
import { planMerge, mergeStep, type SizerInput } from './merge.ts'
import { mergedMidpointsNm } from './output.ts'
import { binsFromMeasurement } from '../sizes/index.ts'
import { comparisonColumns, instrumentKernels, instrumentWavelengths, MeasuredAlignment, RowComparer, type ComparisonPlan, type MeasuredChannel } from './optical.ts'
import { comparisonNotes } from './optical-summary.ts'
import { humidityComparisonNote, humidityOnRows, HumidityTally } from './humidity.ts'
import { formatDuration, formatTimeStamp, regularTimeBase, TimeAverager, typicalInterval } from './timebase.ts'
export interface CampaignRecord {
  /** The sample that gives composition, humidity and layer. */
  sample: Sample
  zoned: boolean
  /** The rows' typical spacing, ms (a spacing above 1.5 times this is drawn as a gap). */
  intervalMs: number
  /** Per row: its start (ms), its time as written, and 1 when it has a distribution (0: a gap, see `gaps`). */
  times: Float64Array
  timeText: string[]
  present: Uint8Array
  /** Rows without a distribution: why (e.g. "only mobility had data"). */
  gaps: Map<number, string>
  /** The bins every row shares (the merged file's midpoints in nm, or the one sizer's own). */
  layout: BinLayout
  bins: number
  /** rows × bins, in the layout's quantity (0 in gaps). */
  values: Float64Array
  /** rows × bins, dN/dlogD (cm⁻³) for the colour map (0 in gaps); the array `values` itself when the layout is in dN/dlogD already (read only, both). */
  dNdlogD: Float64Array
  /** Bin edges, µm. */
  edgesUm: Float64Array
  /** The record's wavelengths (the study's, the chosen one and the instruments'), ascending. */
  wavelengthsNm: number[]
  /** Those whose figure columns are computed (all, or the charts' until `completeRecord`), ascending. */
  figuresNm: number[]
  chosenNm: number
  /** What `completeRecord` needs to compute the other wavelengths as these were: the materials and the tolerance. */
  userMaterials: Study['user_materials']
  tolerance: number
  /**
   * The columns of `cells` (as `series` names them, after its `time`): figures at `figuresNm`, then the comparison.
   * A record made for its charts has the charts' wavelengths' figure columns only; completeRecord lays the cells out
   * again with every wavelength's, in `series`' order.
   */
  columns: string[]
  /** rows × columns; NaN for an empty cell (gaps, rows without a measured record). */
  cells: Float64Array
  /** Measured channels and their per-row means (rows × channels, NaN: none). */
  channels: MeasuredChannel[]
  measured: Float64Array
  /** How the measured figures were made comparable (as series writes them in its "#" lines). */
  notes: string[]
  /**
   * The sample's relative humidity recorded in the files, per row, % (NaN: none), averaged onto the rows from
   * `rhFile`: the nephelometer's file when it records one (the humidity its scattering, compared here, was measured
   * at), else the first sizer file that does; absent when no file records a humidity.
   */
  rh?: Float64Array
  rhFile?: string
  files: CampaignFileSummary[]
}

/** What `buildCampaignRecord` gives: every file's summary, and the record when a sizer could be read. */
export interface CampaignBuild {
  files: CampaignFileSummary[]
  record?: CampaignRecord
  /** Why there is no record (no sizer, or none that could be read), with the fix. */
  problem?: { message: string; fix: string }
}

/** Column names of the figures, after `time`, as `series` writes them. */
export function figureColumns(wavelengthsNm: readonly number[]): string[] {
  const cols: string[] = []
  for (const w of wavelengthsNm) cols.push(`ext_${w}nm_Mm-1`, `sca_${w}nm_Mm-1`, `abs_${w}nm_Mm-1`, `ssa_${w}nm`, `g_${w}nm`)
  cols.push('dry_number_cm-3', 'dry_volume_um3_cm-3', 'dry_mass_ug_m-3')
  return cols
}

const rounded6 = (v: number): number => (Number.isNaN(v) ? NaN : Number(v.toPrecision(6)))

interface Rows {
  timesMs: number[]
  timeText: string[]
  present: boolean[]
  gaps: Map<number, string>
  layout: BinLayout
  values: Float64Array
}

/** Several sizers merged onto a regular time base, values rounded as the merged file holds them. */
function mergedRows(sizers: ReadSizer[], settings: CampaignSettings): Rows {
  const zoned = sizers[0].zoned
  for (const s of sizers.slice(1)) {
    if (s.zoned !== zoned) throw new InputError(s.summary.name, `its times ${s.zoned ? 'carry a zone' : 'have no zone'} but those of ${sizers[0].summary.name} ${zoned ? 'carry one' : 'do not'}`, 'Write every file\'s times in the same form (best in UTC with Z).')
  }
  const intervals = sizers.map((s) => typicalInterval(s.timesMs)).filter((v): v is number => v !== undefined)
  const stepMs = settings.step_s !== undefined ? settings.step_s * 1000 : intervals.length > 0 ? Math.max(...intervals) : undefined
  if (stepMs === undefined) throw new InputError('campaign', 'every sizer file has a single time, so no averaging step is known', 'Give the averaging step (e.g. 300 s).')
  let first = Infinity
  let last = -Infinity
  for (const s of sizers) {
    first = Math.min(first, s.timesMs[0])
    last = Math.max(last, s.timesMs[s.timesMs.length - 1])
  }
  const base = regularTimeBase(first, last, stepMs)
  const steps = base.starts.length
  const buf = sizers.map((s) => new Float64Array(s.factor.length))
  const averagers = sizers.map((s, i) => {
    const a = new TimeAverager(base, s.factor.length)
    const b = buf[i]
    for (let k = 0; k < s.rows; k++) {
      for (let j = 0; j < b.length; j++) b[j] = s.values[k * s.bins + j] * s.factor[j]
      a.add(s.timesMs[k], b)
    }
    return a
  })
  const means = averagers.map((a) => a.means())
  const inputs: SizerInput[] = sizers.map((s) => ({ kind: s.summary.kind as SizerInput['kind'], label: s.summary.name, edgesUm: s.edgesUm }))
  const c = settings.counter
  const plan = planMerge(inputs, {
    shapeFactor: settings.shape_factor,
    density: settings.density_g_cm3,
    ...(c ? { optical: { index: { n: c.n, k: c.k }, geometry: { wavelengthNm: c.wavelength_nm, lowDeg: c.angles_deg[0], highDeg: c.angles_deg[1] } } } : {})
  })
  const bins = plan.edges.length - 1
  const values = new Float64Array(steps * bins)
  const merged = new Float64Array(bins)
  const present: boolean[] = []
  const gaps = new Map<number, string>()
  const timesMs: number[] = []
  const timeText: string[] = []
  for (let k = 0; k < steps; k++) {
    const vals = means.map((m) => m[k])
    mergeStep(plan, vals, merged)
    let full = true
    for (let j = 0; j < bins; j++) {
      const v = rounded6(merged[j])
      if (Number.isNaN(v)) full = false
      values[k * bins + j] = Number.isNaN(v) ? 0 : v
    }
    timesMs.push(base.starts[k])
    timeText.push(formatTimeStamp(base.starts[k], zoned))
    present.push(full)
    if (!full) {
      const had = sizers.filter((_, i) => vals[i]).map((s) => s.summary.kind)
      gaps.set(k, had.length > 0 ? `only ${had.join(' and ')} had data` : 'no sizer had data')
      values.fill(0, k * bins, (k + 1) * bins)
    }
  }
  return { timesMs, timeText, present, gaps, layout: { diameters: mergedMidpointsNm(plan), diameter_unit: 'nm', edges: false, quantity: 'dN/dlogDp' }, values }
}

/** One sizer (or a merged file) row by row, as `series` reads it. */
function singleRows(s: ReadSizer): Rows {
  const t = s.table
  return {
    timesMs: Array.from(s.timesMs),
    timeText: s.timeText,
    present: s.timeText.map(() => true),
    gaps: new Map(),
    layout: { diameters: t.diameters.slice(), diameter_unit: t.diameterUnit, edges: t.edges, quantity: t.quantity },
    values: s.values
  }
}

/** A campaign's files as read (readCampaignFiles): every file's summary, and those that could be read. */
export interface CampaignFiles {
  files: CampaignFileSummary[]
  sizers: ReadSizer[]
  instruments: ReadInstrument[]
}

type RecordOptions = { tolerance?: number; workspace?: OpticsWorkspace; onProgress?: (share: number) => void; figures?: 'all' | 'charts' }

/**
 * A file read ahead, before the record was asked for (the app's worker reads the files it measured while the page
 * sets the record up): a sizer's lines (`readSizerPart`), or a measured file as `readCampaignInstrument` read it as
 * that kind. A record adds its notes to the summary it is given: to give the same reading to another record, give
 * it `readingForAnotherRecord`'s copy.
 */
export type ReadAhead = { kind: CampaignFileKind; name: string; part: SizerPart } | { kind: CampaignFileKind; name: string; instrument: ReturnType<typeof readCampaignInstrument> }

/**
 * A reading to give one more record, when a reader keeps its readings from one record to the next (the app's record
 * worker does, so that a changed parameter does not read the files again). A record only reads a sizer's part and a
 * measured file's records, but it adds its notes to a measured file's summary (and may refuse the file there): each
 * record gets its own copy of that summary, and the arrays are shared.
 */
export function readingForAnotherRecord(a: ReadAhead): ReadAhead {
  return 'part' in a ? a : { ...a, instrument: { ...a.instrument, summary: structuredClone(a.instrument.summary) } }
}

/**
 * The record of a campaign from its files' texts. A file that cannot be read is refused in its summary and left
 * out; without a readable sizer there is no record (`problem` says why). Throws InputError only for what no file
 * alone is to blame for (the study's sample or composition, clocks of different forms). The reading
 * (readCampaignFiles) and the record made from what was read (campaignRecord) are also there apart, for readers
 * that share the files (the app's workers).
 */
export function buildCampaignRecord(inputs: readonly CampaignInput[], settings: CampaignSettings, study: Pick<Study, 'samples' | 'user_materials' | 'wavelengths_nm'>, options: RecordOptions & { ahead?: readonly (ReadAhead | undefined)[] } = {}): CampaignBuild {
  checkCampaign(inputs, settings, study)
  const read = readCampaignFiles(inputs, settings, options.ahead)
  options.onProgress?.(0.2)
  return campaignRecord(read, settings, study, options)
}

/** Throws InputError when the campaign cannot be made whatever its files hold: no such sample, a parameter missing. */
export function checkCampaign(inputs: readonly Pick<CampaignInput, 'kind' | 'name'>[], settings: CampaignSettings, study: Pick<Study, 'samples'>): Sample {
  const sample = study.samples.find((s) => s.name === settings.sample)
  if (!sample) throw new InputError('campaign.sample', `no sample is named "${settings.sample}"`, 'Choose the sample whose composition and humidity the record takes.')
  // what the merge needs, for the files given (the settings' own file list may lag behind)
  const problem = campaignProblems({ ...settings, files: inputs.map((i) => ({ kind: i.kind, path: i.name })) }, [sample.name])[0]
  if (problem) throw new InputError(problem.path, problem.message, problem.fix)
  return sample
}

/**
 * Each file read on its own (a file that cannot be read is refused in its summary). `ahead[i]`: input i read
 * already (ReadAhead), used when it was read as the same kind under the same name.
 */
export function readCampaignFiles(inputs: readonly CampaignInput[], settings: Pick<CampaignSettings, 'density_g_cm3'>, ahead: readonly (ReadAhead | undefined)[] = []): CampaignFiles {
  const read: CampaignFiles = { files: [], sizers: [], instruments: [] }
  inputs.forEach((input, i) => {
    const a = ahead[i]?.kind === input.kind && ahead[i]?.name === input.name ? ahead[i] : undefined
    if (isSizerKind(input.kind)) addCampaignFile(read, readCampaignSizer(input, settings.density_g_cm3, a && 'part' in a ? a.part : undefined))
    else addCampaignFile(read, a && 'instrument' in a ? a.instrument : readCampaignInstrument(input))
  })
  return read
}

/** Adds a file's reading (in the files' order): its summary, and the file itself when it could be read. */
export function addCampaignFile(read: CampaignFiles, r: ReadSizer | ReadInstrument | { summary: CampaignFileSummary }): void {
  read.files.push(r.summary)
  if (!r.summary.ok) return
  if ('table' in r) read.sizers.push(r)
  else if ('records' in r) read.instruments.push(r)
}

/** The record from the campaign's files as read (the second half of buildCampaignRecord). */
export function campaignRecord(read: CampaignFiles, settings: CampaignSettings, study: Pick<Study, 'samples' | 'user_materials' | 'wavelengths_nm'>, options: RecordOptions = {}): CampaignBuild {
  const progress = options.onProgress ?? (() => {})
  const sample = checkCampaign(read.files, settings, study)
  const { files, sizers, instruments } = read
  if (sizers.length === 0) {
    const any = files.some((f) => isSizerKind(f.kind))
    return { files, problem: any ? { message: 'no sizer file could be read', fix: 'Fix the sizer file as its summary says, or point at the right file.' } : { message: 'the campaign has no sizer file yet', fix: 'Add a mobility, aerodynamic or optical sizer export, or a merged size distribution.' } }
  }
  const rows = sizers.length > 1 ? mergedRows(sizers, settings) : singleRows(sizers[0])
  if (sizers.length === 1 && sizers[0].summary.kind !== 'merged') sizers[0].summary.notes.push('one sizer: its diameters are taken as they are (merging converts to volume-equivalent diameters)')
  const zoned = sizers[0].zoned
  const n = rows.timesMs.length
  const bins = binCount(rows.layout)

  // measured channels, in file order; one file per kind, so no channel repeats
  const channels: MeasuredChannel[] = []
  const firsts: number[] = []
  for (const f of instruments) {
    firsts.push(channels.length)
    for (const c of f.header.channels) channels.push({ quantity: c.quantity, wavelengthNm: c.wavelengthNm, file: f.summary.name })
  }
  const t = settings.truncation?.angles_deg
  const plan: ComparisonPlan = { channels, truncation: t && channels.some((c) => c.quantity === 'scattering') ? { lowDeg: t[0], highDeg: t[1] } : null, closure: null }
  const base = [...new Set([...study.wavelengths_nm, settings.wavelength_nm])].sort((a, b) => a - b)
  const wavelengthsNm = [...new Set([...base, ...instrumentWavelengths(plan)])].sort((a, b) => a - b)

  const ws = options.workspace ?? new OpticsWorkspace()
  const tolerance = options.tolerance ?? 1e-4
  const studyAt = { wavelengths_nm: wavelengthsNm, user_materials: study.user_materials }
  const figuresNm = options.figures === 'charts' ? chartWavelengthsNm(wavelengthsNm, settings.wavelength_nm, channels) : wavelengthsNm
  const kernels = binOpticsKernels(sample, { ...studyAt, wavelengths_nm: figuresNm }, rows.layout, { tolerance, workspace: ws })
  progress(0.4)
  // the columns of the wavelengths computed (all, or the charts' until completeRecord adds the others): a year's
  // cells at 16 wavelengths would be 78 MB, at the charts' 3 or 4 about 26 MB
  const width = binnedRowWidth({ wavelengthsNm: figuresNm })
  const compareCols = channels.length > 0 ? comparisonColumns(plan) : []
  const columns = [...figureColumns(figuresNm), ...compareCols]
  const cells = new Float64Array(n * columns.length).fill(NaN)
  const measured = new Float64Array(n * channels.length).fill(NaN)

  // the rows with a distribution are the time base of the measured files (as series aligns to the rows it reads)
  const kept: number[] = []
  for (let k = 0; k < n; k++) if (rows.present[k]) kept.push(k)
  const keptTimes = kept.map((k) => rows.timesMs[k])
  const intervalMs = typicalInterval(keptTimes) ?? typicalInterval(rows.timesMs) ?? 60000
  let notes: string[] = []
  if (channels.length > 0 && kept.length > 0) {
    const alignment = new MeasuredAlignment(keptTimes, channels, typicalInterval(keptTimes))
    instruments.forEach((f, i) => {
      for (const rec of f.records) {
        if (rec.zoned !== zoned) {
          f.summary.ok = false
          f.summary.error = { where: `${f.summary.name} line ${rec.line} column 1`, problem: `the time ${rec.time} ${rec.zoned ? 'has a zone' : 'has no zone'} but the sizer's times ${zoned ? 'have one' : 'have none'}, so the clocks cannot be aligned`, fix: 'Write both files\' times in the same form (both in UTC with Z, or both without a zone on the same clock).' }
          break
        }
        alignment.add(rec.ms, firsts[i], rec.values, f.summary.name)
      }
      const used = alignment.used.get(f.summary.name) ?? 0
      f.summary.notes.push(`${used} records inside the record's rows, ${alignment.outside.get(f.summary.name) ?? 0} outside them`)
      if (used === 0) f.summary.notes.push('warning: no record falls inside a sizer row: check the two clocks (times, zone)')
    })
    const comparer = new RowComparer(instrumentKernels(sample, studyAt, rows.layout, plan, { tolerance, workspace: ws }), plan)
    const m = new Float64Array(channels.length)
    const out = new Float64Array(compareCols.length)
    const row = new Float64Array(bins)
    kept.forEach((k, i) => {
      alignment.measuredAt(i, m)
      measured.set(m, k * channels.length)
      row.set(rows.values.subarray(k * bins, (k + 1) * bins))
      out.fill(NaN)
      comparer.compare(row, m, out)
      cells.set(out, k * columns.length + width)
      if (i % 4096 === 4095) progress(0.6 + (0.2 * i) / kept.length)
    })
    const neph = instruments.find((f) => f.summary.kind === 'scattering' && f.summary.ok)
    const tally = new HumidityTally()
    for (const rec of neph?.records ?? []) tally.add(rec.rh)
    const humidity = neph && humidityComparisonNote(neph.summary.name, tally, sample.rh_percent)
    notes = comparisonNotes(plan, { intervalText: formatDuration(Math.round(intervalMs)), files: instruments.map((f) => f.summary.name), humidity })
  }
  const humidity = humidityOnRecordRows(rows.timesMs, intervalMs, instruments, sizers)
  progress(0.8)
  fillFigures(kernels, rows.layout, figuresNm, rows.values, bins, kept, cells, columns.length, (i) => progress(0.8 + (0.2 * i) / kept.length))
  const dNdlogD = mapValues(rows.layout, kernels.kind.densityGcm3, rows.values, n, bins, kept)
  return {
    files,
    record: {
      sample,
      zoned,
      intervalMs,
      times: Float64Array.from(rows.timesMs),
      timeText: rows.timeText,
      present: Uint8Array.from(rows.present, (p) => (p ? 1 : 0)),
      gaps: rows.gaps,
      layout: rows.layout,
      bins,
      values: rows.values,
      dNdlogD,
      edgesUm: kernels.edgesUm,
      wavelengthsNm,
      figuresNm: [...figuresNm],
      chosenNm: settings.wavelength_nm,
      userMaterials: study.user_materials,
      tolerance,
      columns,
      cells,
      channels,
      measured,
      notes,
      files,
      ...humidity
    }
  }
}

/**
 * The wavelengths whose figures the record's charts draw (recordSeries): the chosen one, the computed ones on either
 * side of it (the Ångström exponent's pair) and the nephelometer's wavelength nearest it (its ratio), ascending.
 */
export function chartWavelengthsNm(wavelengthsNm: readonly number[], chosenNm: number, channels: readonly MeasuredChannel[]): number[] {
  const at = wavelengthsNm.indexOf(chosenNm)
  const want = [chosenNm, ...angstromPairNm(wavelengthsNm, chosenNm)]
  const sca = nearestScattering(channels, chosenNm)
  if (sca) want.push(sca.wavelengthNm)
  return at < 0 ? [...wavelengthsNm] : wavelengthsNm.filter((w) => want.includes(w))
}

/** The Ångström exponent's wavelengths: the record's on either side of the chosen one (the chosen one at an end). */
export function angstromPairNm(wavelengthsNm: readonly number[], chosenNm: number): [number, number] {
  const at = wavelengthsNm.indexOf(chosenNm)
  return [wavelengthsNm[Math.max(0, at - 1)], wavelengthsNm[Math.min(wavelengthsNm.length - 1, at + 1)]]
}

/** The scattering channel whose wavelength is nearest the chosen one (the first of two as near), with its index. */
export function nearestScattering(channels: readonly MeasuredChannel[], chosenNm: number): (MeasuredChannel & { index: number }) | undefined {
  let best: (MeasuredChannel & { index: number }) | undefined
  channels.forEach((c, index) => {
    if (c.quantity !== 'scattering') return
    if (!best || Math.abs(c.wavelengthNm - chosenNm) < Math.abs(best.wavelengthNm - chosenNm)) best = { ...c, index }
  })
  return best
}

/**
 * Each kept row's figures at the kernels' wavelengths, written into their columns of `cells` (`figureColumns` of
 * `allNm`: five per wavelength, then the three totals), one evaluator for every row.
 */
function fillFigures(kernels: BinKernels, layout: BinLayout, allNm: readonly number[], values: Float64Array, bins: number, kept: readonly number[], cells: Float64Array, stride: number, progress: (i: number) => void): void {
  const evaluate = binnedRowEvaluator(kernels, layout)
  const fig = new Float64Array(binnedRowWidth(kernels))
  const to = kernels.wavelengthsNm.map((w) => 5 * allNm.indexOf(w))
  const totals = 5 * allNm.length
  const contiguous = to.every((c, j) => c === 5 * j) && to.length === allNm.length
  for (let i = 0; i < kept.length; i++) {
    const k = kept[i]
    const row = k * stride
    if (contiguous) evaluate(values, k * bins, cells, row)
    else {
      evaluate(values, k * bins, fig, 0)
      for (let j = 0; j < to.length; j++) for (let f = 0; f < 5; f++) cells[row + to[j] + f] = fig[5 * j + f]
      cells[row + totals] = fig[5 * to.length]
      cells[row + totals + 1] = fig[5 * to.length + 1]
      cells[row + totals + 2] = fig[5 * to.length + 2]
    }
    if (i % 4096 === 4095) progress(i)
  }
}

/** True when every wavelength's figures are in the record's cells. */
export const recordComplete = (r: CampaignRecord): boolean => r.figuresNm.length === r.wavelengthsNm.length

/**
 * Computes the figures of a record made for its charts at its other wavelengths, with the sample, materials and
 * tolerance it was made with: the cells laid out again with every wavelength's columns (`series`' order), the
 * computed ones copied, the others from the same kernels at those wavelengths and the same arithmetic as a record
 * computed whole, so the same numbers. Nothing to do for a complete record.
 */
export function completeRecord(r: CampaignRecord, options: { workspace?: OpticsWorkspace } = {}): void {
  const missing = r.wavelengthsNm.filter((w) => !r.figuresNm.includes(w))
  if (missing.length === 0) return
  const kernels = binOpticsKernels(r.sample, { wavelengths_nm: missing, user_materials: r.userMaterials }, r.layout, { tolerance: r.tolerance, workspace: options.workspace ?? new OpticsWorkspace() })
  const n = r.present.length
  const columns = [...figureColumns(r.wavelengthsNm), ...r.columns.slice(figureColumns(r.figuresNm).length)]
  const w = r.columns.length
  const width = columns.length
  const cells = new Float64Array(n * width).fill(NaN)
  const to = r.columns.map((name) => columns.indexOf(name))
  for (let k = 0; k < n; k++) for (let c = 0; c < w; c++) cells[k * width + to[c]] = r.cells[k * w + c]
  const kept: number[] = []
  for (let k = 0; k < n; k++) if (r.present[k]) kept.push(k)
  fillFigures(kernels, r.layout, r.wavelengthsNm, r.values, r.bins, kept, cells, width, () => {})
  r.columns = columns
  r.cells = cells
  r.figuresNm = [...r.wavelengthsNm]
}

/** The record's humidity from the files (see CampaignRecord.rh): the nephelometer's, else the first sizer's. */
function humidityOnRecordRows(rowTimesMs: number[], intervalMs: number, instruments: ReadInstrument[], sizers: ReadSizer[]): { rh?: Float64Array; rhFile?: string } {
  for (const f of instruments) {
    if (f.summary.kind !== 'scattering' || !f.summary.ok || !f.summary.humidity?.rows) continue
    const rh = humidityOnRows(rowTimesMs, intervalMs, f.records.map((r) => r.ms), f.records.map((r) => r.rh ?? NaN))
    return { rh, rhFile: f.summary.name }
  }
  for (const s of sizers) {
    if (!s.rh || !s.summary.humidity?.rows) continue
    return { rh: humidityOnRows(rowTimesMs, intervalMs, s.timesMs, s.rh), rhFile: s.summary.name }
  }
  return {}
}

/**
 * dN/dlogD for the colour map: the layout's quantity turned by the same kernels' conversion (number weights), 0 in
 * the gaps. A layout in dN/dlogD already (every factor exactly 1, as in a merged file) gives the values themselves:
 * v × 1 is v to the last bit, and a year's copy (80 MB) is not made. Fresh memory is dear here: touching it
 * the first time cost about 6 ms a megabyte on the machine measured (DEVELOPERS.md).
 */
function mapValues(layout: BinLayout, density: number, values: Float64Array, n: number, bins: number, kept: readonly number[]): Float64Array {
  const toDn = quantityFactors(layout, density)
  if (toDn.every((f) => f === 1) && values.length === n * bins) return values
  const dNdlogD = new Float64Array(n * bins)
  for (const k of kept) for (let j = 0; j < bins; j++) dNdlogD[k * bins + j] = values[k * bins + j] * toDn[j]
  return dNdlogD
}

/** Per bin, the factor that turns a value of the layout's quantity into dN/dlogD (binsFromMeasurement's own conversion). */
function quantityFactors(layout: BinLayout, density: number): Float64Array {
  const n = binCount(layout)
  return binsFromMeasurement({ diameters: layout.diameters, diameterKind: layout.edges ? 'edges' : 'midpoints', diameterUnit: layout.diameter_unit, quantity: layout.quantity, values: new Array(n).fill(1), density }).dNdlogD
}
