// motebench series --scattering FILE --absorption FILE: the measured coefficients of optical instruments beside the
// sizer, averaged onto its rows and compared with the computed ones. The physics (reading, alignment, kernels,
// per-row comparison, summary) lives in src-core/field/optical*.ts; this file reads the files and hands the
// series pipeline a few extra cells per row.
//
// Before the series runs, the sizer file is read once for its rows' time stamps (the time base: one step per
// row), and each instrument file is read as a stream into per-row sums (memory follows the sizer's rows).
import { createReadStream } from 'node:fs'
import { basename } from 'node:path'
import { createInterface } from 'node:readline'
import {
  comparisonColumns,
  comparisonNotes,
  createOpticalReader,
  createSizerReader,
  DEFAULT_NEPHELOMETER_ANGLES,
  formatDuration,
  HumidityTally,
  humidityComparisonNote,
  InputError,
  instrumentKernels,
  instrumentKernelsInputs,
  instrumentKernelsLength,
  instrumentWavelengths,
  packInstrumentKernels,
  MeasuredAlignment,
  OpticsWorkspace,
  RatioCollector,
  readInstrumentTime,
  RowComparer,
  typicalInterval,
  type BinLayout,
  type ComparisonPlan,
  type MeasuredChannel,
  type OpticalQuantity,
  type Sample,
  type SizerOptions,
  type UserMaterialSpec,
  type OpticalRejection
} from '../../src-core/index.ts'
import { readPair, UsageError } from './common.ts'
import { keptKernels, kernelSourceLine, type KernelSource } from './kernel-cache.ts'

export const seriesOpticalHelp = `  --scattering FILE     measured scattering (and hemispheric backscattering) coefficients beside the sizer:
                        "# units: Mm-1", then a header time,scattering 450 nm,backscattering 450 nm,...
                        (one column per quantity and wavelength; see the README); each row then gets the
                        measured values, the ratios computed/measured and, with --absorption, the measured ω
  --absorption FILE     measured absorption coefficients, same layout (columns "absorption 660 nm")
  --truncation          correct the measured scattering for the nephelometer's truncation, from each row's
                        own computed phase function, before comparing
  --neph-angles A:B     the angles the nephelometer sees, degrees (default ${DEFAULT_NEPHELOMETER_ANGLES.join(':')}, a stated example)
  --closure             per row, the effective index n + ik that reproduces the measured coefficients, with
                        its uncertainty and a not-unique flag (slow: tens of seconds a row)
  --closure-sd S:A      relative uncertainty given to measured scattering and absorption in the closure,
                        percent (default 10:25)
The computed figures are added at the instruments' wavelengths. A row whose interval holds no measured record
gets empty measured cells (never filled). The summary gives the median and 5–95 % range of each ratio.`

export const SERIES_OPTICAL_OPTIONS = {
  scattering: { type: 'string' },
  absorption: { type: 'string' },
  truncation: { type: 'boolean', default: false },
  'neph-angles': { type: 'string' },
  closure: { type: 'boolean', default: false },
  'closure-sd': { type: 'string' }
} as const

export interface SeriesOpticalArgs {
  scattering?: string
  absorption?: string
  truncation?: boolean
  'neph-angles'?: string
  closure?: boolean
  'closure-sd'?: string
}

async function* fileLines(path: string): AsyncGenerator<string> {
  const stream = createReadStream(path, { encoding: 'utf8' })
  const lines = createInterface({ input: stream, crlfDelay: Infinity })
  try {
    for await (const line of lines) yield line
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') throw new UsageError(`series: ${path} does not exist`)
    throw e
  } finally {
    lines.close()
    stream.destroy()
  }
}

/** An A:B option of series (the nephelometer's angles, ...). */
function readSeriesPair(text: string, flag: string): [number, number] {
  return readPair(text, { command: 'series', flag, example: flag === '--neph-angles' ? '7:170' : '10:25' })
}

/** What series adds to each row: extra columns, header comments, the cells of a row and the summary. */
export interface SeriesExtra {
  columns: string[]
  headerComments: string[]
  /** The extra cells of a record (computed when it is read); NaN: empty. */
  cells(time: string, values: readonly number[], bins: BinLayout): Float64Array
  /** Called for each row written, with its extra cells. */
  written(cells: Float64Array): void
  summary(): string[]
  /** Rows of the instrument files left out by their reader (bad time or cell); series exits 1 when any. */
  rowsLeftOut: number
}

/** Reads the instrument files and prepares the comparison; undefined when no instrument file is given. */
export async function prepareSeriesOptical(
  args: SeriesOpticalArgs,
  o: { sizerPath: string; sizer: Pick<SizerOptions, 'diameterUnit' | 'quantity' | 'layout'>; sample: Sample; userMaterials: UserMaterialSpec[]; tolerance: number }
): Promise<{ extra: SeriesExtra; wavelengthsNm: number[] } | undefined> {
  if (args.scattering === undefined && args.absorption === undefined) {
    if (args.truncation || args.closure || args['neph-angles'] !== undefined || args['closure-sd'] !== undefined) throw new UsageError('series: --truncation, --neph-angles and --closure need --scattering and/or --absorption')
    return undefined
  }
  if (args['neph-angles'] !== undefined && !args.truncation) throw new UsageError('series: --neph-angles gives the angles of the truncation correction: add --truncation')
  if (args['closure-sd'] !== undefined && !args.closure) throw new UsageError('series: --closure-sd gives the uncertainties of the closure: add --closure')
  if ((args.truncation || args['neph-angles'] !== undefined) && args.scattering === undefined) throw new UsageError('series: --truncation corrects measured scattering: give --scattering FILE')
  const angles = readSeriesPair(args['neph-angles'] ?? DEFAULT_NEPHELOMETER_ANGLES.join(':'), '--neph-angles')
  const sd = readSeriesPair(args['closure-sd'] ?? '10:25', '--closure-sd')
  if (!(sd[0] > 0 && sd[1] > 0)) throw new UsageError('series: --closure-sd gives percentages above 0, e.g. 10:25')

  // 1. The sizer rows' times: the time base.
  const sizerName = basename(o.sizerPath)
  const times: number[] = []
  let sizerZoned: boolean | undefined
  let unstamped = 0
  let lastLine = 0
  const reader = createSizerReader({
    ...o.sizer,
    fileName: sizerName,
    onBadRow: 'skip',
    onRecord: (r) => {
      const t = readInstrumentTime(r.time)
      if (!t || (sizerZoned !== undefined && t.zoned !== sizerZoned)) {
        unstamped++
        return
      }
      sizerZoned = t.zoned
      if (times.length > 0 && !(t.ms > times[times.length - 1])) {
        throw new InputError(`${sizerName} line ${r.line} column 1`, `the time ${r.time} does not follow the row before it (line ${lastLine}), so measured data cannot be aligned to the rows`, 'Sort the sizer rows by time and remove repeated times.')
      }
      times.push(t.ms)
      lastLine = r.line
    }
  })
  for await (const line of fileLines(o.sizerPath)) reader.push(line)
  reader.end()
  if (times.length === 0) throw new InputError(sizerName, 'no sizer row has an ISO 8601 time stamp, so measured data cannot be aligned to it', 'Give the sizer rows times such as 2026-06-01T10:05:00Z.')
  const interval = typicalInterval(times)

  // 2. The instrument files into per-row means.
  const files: { path: string; allowed: OpticalQuantity[]; flag: string }[] = []
  if (args.scattering !== undefined) files.push({ path: args.scattering, allowed: ['scattering', 'backscattering'], flag: '--scattering' })
  if (args.absorption !== undefined) files.push({ path: args.absorption, allowed: ['absorption'], flag: '--absorption' })
  const channels: MeasuredChannel[] = []
  const pending: { name: string; first: number }[] = []
  // The channels must be known before the alignment is built; each file's header comes first, so read headers
  // in a first short pass (stop at the first row), then stream the rows.
  for (const f of files) {
    const name = basename(f.path)
    let first: MeasuredChannel[] | undefined
    const probe = createOpticalReader({ fileName: name, allowed: f.allowed, allowedWhere: f.flag, onRecord: () => {} })
    for await (const line of fileLines(f.path)) {
      probe.push(line)
      if (probe.header) {
        first = probe.header.channels.map(({ quantity, wavelengthNm }) => ({ quantity, wavelengthNm, file: name }))
        break
      }
    }
    if (!first) probe.end() // throws: no header
    for (const c of first!) {
      const other = channels.find((x) => x.quantity === c.quantity && x.wavelengthNm === c.wavelengthNm)
      if (other) throw new InputError(name, `${c.quantity} at ${c.wavelengthNm} nm is also in ${other.file}`, 'Give each quantity and wavelength in one file only.')
    }
    pending.push({ name, first: channels.length })
    channels.push(...first!)
  }
  const alignment = new MeasuredAlignment(times, channels, interval)
  const noneInside: string[] = []
  const leftOut: { name: string; rejected: OpticalRejection[]; count: number }[] = []
  const nephHumidity = new HumidityTally() // the --scattering file's recorded humidity, for the notes
  for (let i = 0; i < files.length; i++) {
    const f = files[i]
    const p = pending[i]
    const r = createOpticalReader({
      fileName: p.name,
      allowed: f.allowed,
      allowedWhere: f.flag,
      onRecord: (rec) => {
        if (rec.zoned !== sizerZoned) {
          throw new InputError(`${p.name} line ${rec.line} column 1`, `the time ${rec.time} ${rec.zoned ? 'has a zone' : 'has no zone'} but the sizer's times ${sizerZoned ? 'have one' : 'have none'}, so the clocks cannot be aligned`, 'Write both files\' times in the same form (both in UTC with Z, or both without a zone on the same clock).')
        }
        alignment.add(rec.ms, p.first, rec.values, p.name)
        if (f.flag === '--scattering') nephHumidity.add(rec.rh)
      }
    })
    for await (const line of fileLines(f.path)) r.push(line)
    const end = r.end()
    if (end.rejectedCount > 0) leftOut.push({ name: p.name, rejected: end.rejected, count: end.rejectedCount })
    if (!alignment.used.get(p.name)) noneInside.push(p.name)
  }

  const plan: ComparisonPlan = {
    channels,
    truncation: args.truncation ? { lowDeg: angles[0], highDeg: angles[1] } : null,
    closure: args.closure ? { scatteringSd: sd[0] / 100, absorptionSd: sd[1] / 100 } : null
  }
  const intervalText = formatDuration(interval ?? 0)
  const humidity = args.scattering === undefined ? undefined : humidityComparisonNote(basename(args.scattering), nephHumidity, o.sample.rh_percent)
  const notes = comparisonNotes(plan, { intervalText, files: pending.map((p) => p.name), humidity })
  const ws = new OpticsWorkspace()
  const measured = new Float64Array(channels.length)
  let comparer: RowComparer | undefined
  let comparerBins: BinLayout | undefined
  const columns = comparisonColumns(plan) // the names do not depend on the bins
  const collector = new RatioCollector(columns)
  let rowsWithData = 0
  let rowsWritten = 0
  const kernelSources: KernelSource[] = []

  const extra: SeriesExtra = {
    columns,
    headerComments: notes,
    cells(time, values, bins) {
      const out = new Float64Array(columns.length).fill(NaN)
      if (comparerBins !== bins || !comparer) {
        // integrated once per layout (a few tenths of a second with the truncation's phase functions), or read from
        // the kernels an earlier run with the same inputs kept (kernel-cache.ts)
        const study = { user_materials: o.userMaterials }
        const kept = keptKernels(instrumentKernelsInputs(o.sample, study, bins, plan, o.tolerance), instrumentKernelsLength(bins, plan), (integrated) => instrumentKernels(o.sample, study, bins, plan, { tolerance: o.tolerance, workspace: ws, integrated }), packInstrumentKernels)
        kernelSources.push(kept.source)
        comparer = new RowComparer(kept.kernels, plan)
        comparerBins = bins
      }
      const t = readInstrumentTime(time)
      const k = t && t.zoned === sizerZoned ? alignment.stepOf(t.ms) : -1
      alignment.measuredAt(k, measured)
      try {
        comparer.compare(values, measured, out)
      } catch (e) {
        if (!(e instanceof InputError)) throw e
        // the series row itself is refused for the same reason, and listed there
      }
      return out
    },
    written(cells) {
      rowsWritten++
      if (cells.some((v, i) => Number.isFinite(v) && columns[i].includes('_meas_'))) rowsWithData++
      collector.add(cells)
    },
    summary() {
      const kernels = kernelSourceLine('instrument kernels', kernelSources, 'composition, humidity, instrument wavelengths, nephelometer angles, bins and tolerance')
      const lines = [`  measured: ${pending.map((p) => `${p.name} (${alignment.used.get(p.name) ?? 0} records in sizer rows, ${alignment.outside.get(p.name) ?? 0} outside them)`).join(', ')}; ${rowsWithData} of ${rowsWritten} rows written have measured data; each row's interval ${intervalText}`]
      if (kernels) lines.push(`  ${kernels}`)
      if (unstamped > 0) lines.push(`  ${unstamped} sizer row${unstamped === 1 ? '' : 's'} without a usable ISO 8601 time: no measured data aligned to ${unstamped === 1 ? 'it' : 'them'}`)
      for (const f of leftOut) {
        lines.push(`  ${f.name}: ${f.count} row${f.count === 1 ? '' : 's'} left out (bad time or cells)`)
        const show = f.rejected.slice(0, 20)
        for (const r of show) lines.push(`  ${f.name} line ${r.line} column ${r.column}: ${r.reason}\n    fix: ${r.fix}`)
        if (f.count > show.length) lines.push(`  ... and ${f.count - show.length} more not shown`)
      }
      for (const n of noneInside) lines.push(`  warning: no record of ${n} falls inside a sizer row: check the two clocks (times, zone)`)
      lines.push(`  ratio computed/measured${plan.truncation ? ` (scattering corrected for truncation, ${angles[0]}–${angles[1]}°)` : ' (no truncation correction)'}: median [5 %, 95 %] over the rows (percentiles: Hyndman & Fan type 7)`)
      for (const s of collector.summary()) {
        lines.push(`    ${s.column.padEnd(18)} ${s.count === 0 ? 'no rows' : `${fmt(s.median)} [${fmt(s.p5)}, ${fmt(s.p95)}] over ${s.count} row${s.count === 1 ? '' : 's'}`}`)
      }
      if (plan.closure) lines.push('  closure: per row in the closure_ columns (dry homogeneous spheres; see the file\'s header comments)')
      return lines
    },
    get rowsLeftOut() {
      return leftOut.reduce((n, f) => n + f.count, 0)
    }
  }
  return { extra, wavelengthsNm: instrumentWavelengths(plan) }
}

const fmt = (v: number) => v.toFixed(3)

