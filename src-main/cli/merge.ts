// motebench merge: several sizers (mobility, aerodynamic, optical counter) merged into one size distribution in
// volume-equivalent diameter, averaged onto one time base, written as a sizer file that series, check and the
// app read. The physics and the merging live in src-core/field; this file reads the files and writes the result.
//
// Each file is read twice as a stream (node:readline into createSizerReader): first the time stamps (to find each
// instrument's interval and the time base), then the values, which go straight into per-step sums. Memory follows
// the number of time steps, not of records.
import { createReadStream } from 'node:fs'
import { basename } from 'node:path'
import { createInterface } from 'node:readline'
import {
  binsFromMeasurement,
  createSizerReader,
  edgesFromMidpoints,
  fitDensity,
  formatDuration,
  formatTimeStamp,
  InputError,
  mergedFileHead,
  mergedFileRow,
  mergeStep,
  MOTEBENCH_VERSION,
  parseComplexIndex,
  parseDuration,
  parseLength,
  parseTimeStamp,
  planMerge,
  regularTimeBase,
  TimeAverager,
  typicalInterval,
  type DensityFit,
  type MergeSettings,
  type SizerHeader,
  type SizerInput,
  type SizerKind
} from '../../src-core/index.ts'
import { atomicFileOutput, EXIT_OK, EXIT_SKIPPED, readArgs, readInteger, readNumber, readPair, UsageError } from './common.ts'
import { readShard, runFingerprint, shardLine, shardRange } from './shard.ts'

export const mergeHelp = `motebench merge --mobility FILE --aerodynamic FILE --density RHO --out FILE: several sizers as one distribution
  --mobility FILE        mobility sizer export (electrical-mobility diameter), one row per time, one column per bin
  --aerodynamic FILE     aerodynamic sizer export (aerodynamic diameter)
  --optical FILE         optical particle counter export (diameters as calibrated with PSL spheres)
  --density RHO          particle density, g cm⁻³ (aerodynamic diameters), e.g. 1.8
  --fit-density          instead of --density: the density that makes the mobility and aerodynamic sizers
                         agree best in their overlap (Khlystov, Stanier & Pandis 2004), with its misfit
  --shape-factor CHI     dynamic shape factor χ, 1 (spheres, default) to 5
  --m N+Ki               optical counter: the sample's refractive index at the laser wavelength
  --wavelength L         optical counter: laser wavelength, e.g. 780nm
  --angles A:B           optical counter: collection half-angles from the beam, degrees, e.g. 35:120
  --mobility-range LO:HI     diameters (as the sizer measures them) inside which it is trusted, e.g. 10nm:600nm;
  --aerodynamic-range LO:HI  default: all its bins (a bare number is nm for mobility, µm otherwise)
  --optical-range LO:HI
  --every T              averaging step, e.g. 10min, 1h (default: the coarsest instrument's interval)
  --bins-per-decade N    merged bins per decade of diameter (default 32)
  --gap-rows P           keep (default): a step where a sizer has no data is written, its uncovered bins empty
                         and its last column, "instruments", naming the sizers that did contribute
                         (readers leave such a row out with the reason); omit: such steps are left out of the
                         table, so that the app imports the file whole (the summary and the file list them)
  --out FILE             the merged sizer file (it appears only when complete)
  --shard K/N            write only the K-th of N contiguous parts of the time steps (after the same head and a
                         shard line); "motebench join" puts the parts together into the whole file
Conversions to the volume-equivalent diameter after DeCarlo et al. (2004, Aerosol Sci. Technol. 38:1185) with
the Cunningham slip correction; each bin keeps its particles. Overlap rule: each sizer is trusted inside its own
range; where two ranges overlap, the weights hand over linearly in log d_ve across the overlap (the lower sizer
from 1 to 0, the upper from 0 to 1, at each merged bin's middle). A sizer without data at a time step drops out
and the others are renormalised; bins no sizer with data covers are left empty (never filled), and the summary
lists those steps. Exit status 0, 1 when rows of an input were left out (listed with file, line and column),
2 for bad input (no output file).`

interface FileRead {
  kind: SizerKind
  path: string
  label: string
  header: SizerHeader
  times: number[]
  zoned: boolean | undefined
  interval: number | undefined
  /** Multiplies each bin's value into dN/dlog d (native diameter). */
  factor: Float64Array
  edgesUm: Float64Array
  left: { line: number; column?: number; reason: string; fix: string }[]
  leftCount: number
}

const KEPT = 1000

async function* fileLines(path: string): AsyncGenerator<string> {
  const stream = createReadStream(path, { encoding: 'utf8' })
  const lines = createInterface({ input: stream, crlfDelay: Infinity })
  try {
    for await (const line of lines) yield line
  } finally {
    lines.close()
    stream.destroy()
  }
}

/** First pass: header, time stamps and the rows left out. */
async function readTimes(kind: SizerKind, path: string, density: number | undefined): Promise<FileRead> {
  const label = basename(path)
  const times: number[] = []
  let zoned: boolean | undefined
  const left: FileRead['left'] = []
  let leftCount = 0
  const leave = (r: { line: number; column?: number; reason: string; fix: string }) => {
    leftCount++
    if (left.length < KEPT) left.push(r)
  }
  const reader = createSizerReader({
    fileName: label,
    onRecord: (r) => {
      const t = parseTimeStamp(r.time)
      if (!t) {
        leave({ line: r.line, column: 1, reason: `"${r.time}" is not an ISO 8601 time stamp; the row is left out`, fix: 'Write times as 2026-06-01T10:05:00Z or 2026-06-01 10:05 (with or without a zone).' })
        return
      }
      if (zoned === undefined) zoned = t.zoned
      else if (zoned !== t.zoned) {
        leave({ line: r.line, column: 1, reason: `the time stamp "${r.time}" ${t.zoned ? 'has a zone' : 'has no zone'} unlike the file's first one; the row is left out`, fix: 'Give every time stamp of the file the same form (all with a zone such as Z or +01:00, or all without).' })
        return
      }
      times.push(t.ms)
    }
  })
  for await (const line of fileLines(path)) reader.push(line)
  const summary = reader.end()
  for (const r of summary.rejected) leave(r)
  leftCount += summary.rejectedCount - summary.rejected.length
  const { rejected: _r, rejectedCount: _c, recordCount: _n, ...header } = summary
  if (times.length === 0) {
    throw new InputError(`${label}${header.headerLine ? ` line ${header.headerLine}` : ''}`, 'no row with an ISO 8601 time stamp and a full set of values was read', `Give one row per time: the time (e.g. 2026-06-01T10:05:00Z), then one value per bin (check it with "motebench check ${label}").`)
  }
  const unit = header.diameterUnit === 'nm' ? 'nm' : 'µm'
  const edgesNative = header.edges ? Float64Array.from(header.diameters) : edgesFromMidpoints(header.diameters, unit)
  const ones = new Array(edgesNative.length - 1).fill(1)
  let bins
  try {
    bins = binsFromMeasurement({ diameters: edgesNative, diameterKind: 'edges', diameterUnit: header.diameterUnit, quantity: header.quantity, values: ones, density })
  } catch (e) {
    if (e instanceof InputError) throw new InputError(`${label} line ${header.headerLine}`, e.message.replace(/\.$/, ''), e.fix)
    throw e
  }
  return { kind, path, label, header, times, zoned, interval: typicalInterval(times), factor: bins.dNdlogD, edgesUm: bins.edges, left, leftCount }
}

/** Second pass: each record's dN/dlog d into the step that holds its time. */
async function accumulate(f: FileRead, averager: TimeAverager): Promise<void> {
  const buf = new Float64Array(f.factor.length)
  const reader = createSizerReader({
    fileName: f.label,
    onRecord: (r) => {
      const t = parseTimeStamp(r.time)
      if (!t || t.zoned !== f.zoned) return // left out and listed in the first pass
      for (let j = 0; j < buf.length; j++) buf[j] = r.values[j] * f.factor[j]
      averager.add(t.ms, buf)
    }
  })
  for await (const line of fileLines(f.path)) reader.push(line)
  reader.end()
}

function readRange(text: string | undefined, flag: string, unit: 'nm' | 'um'): [number, number] | undefined {
  if (text === undefined) return undefined
  const [lo, hi] = readPair(text, { command: 'merge', flag, form: 'LO:HI', example: unit === 'nm' ? '10nm:600nm' : '0.7um:20um' }, (part) => parseLength(part, flag, unit))
  if (!(hi > lo)) throw new UsageError(`merge: ${flag} "${text}": the upper diameter must exceed the lower`)
  return [lo, hi]
}

export async function runMerge(argv: string[]): Promise<number> {
  const { values } = readArgs('merge', argv, {
    mobility: { type: 'string' },
    aerodynamic: { type: 'string' },
    optical: { type: 'string' },
    density: { type: 'string' },
    'fit-density': { type: 'boolean', default: false },
    'shape-factor': { type: 'string' },
    m: { type: 'string' },
    wavelength: { type: 'string' },
    angles: { type: 'string' },
    'mobility-range': { type: 'string' },
    'aerodynamic-range': { type: 'string' },
    'optical-range': { type: 'string' },
    every: { type: 'string' },
    'bins-per-decade': { type: 'string' },
    'gap-rows': { type: 'string' },
    out: { type: 'string' },
    shard: { type: 'string' }
  })
  const files: [SizerKind, string][] = []
  if (values.mobility !== undefined) files.push(['mobility', values.mobility])
  if (values.aerodynamic !== undefined) files.push(['aerodynamic', values.aerodynamic])
  if (values.optical !== undefined) files.push(['optical', values.optical])
  if (files.length < 2) throw new UsageError('merge: give at least two sizer files, e.g. --mobility mobility.csv --aerodynamic aerodynamic.csv')
  if (values.out === undefined) throw new UsageError('merge: --out is required, e.g. --out merged.csv')
  const fit = values['fit-density']
  if (fit && values.density !== undefined) throw new UsageError('merge: give --density or --fit-density, not both')
  if (fit && (values.mobility === undefined || values.aerodynamic === undefined)) throw new UsageError('merge: --fit-density needs both --mobility and --aerodynamic (it matches them in their overlap)')
  if (values.aerodynamic !== undefined && !fit && values.density === undefined) throw new UsageError('merge: --density is required with --aerodynamic, e.g. --density 1.8 (g cm⁻³), or use --fit-density')
  const density = values.density === undefined ? undefined : readNumber(values.density, '--density')
  if (density !== undefined && !(density >= 0.1 && density <= 25)) throw new UsageError(`merge: --density ${values.density} is outside 0.1 to 25 g cm⁻³`)
  const shapeFactor = readNumber(values['shape-factor'], '--shape-factor', 1)
  if (!(shapeFactor >= 1 && shapeFactor <= 5)) throw new UsageError(`merge: --shape-factor ${values['shape-factor']} is outside 1 to 5 (1 for spheres)`)
  const binsPerDecade = readInteger(values['bins-per-decade'], '--bins-per-decade', 4, 256, 32)
  let optical: MergeSettings['optical']
  if (values.optical !== undefined) {
    if (values.m === undefined || values.wavelength === undefined || values.angles === undefined) {
      throw new UsageError('merge: --optical needs --m (the sample index), --wavelength (the laser) and --angles (collection angles), e.g. --m 1.53+0.01i --wavelength 780nm --angles 35:120')
    }
    const angles = readPair(values.angles, { command: 'merge', flag: '--angles', example: '35:120' })
    optical = {
      index: parseComplexIndex(values.m, '--m'),
      geometry: { wavelengthNm: parseLength(values.wavelength, '--wavelength', 'nm') * 1000, lowDeg: angles[0], highDeg: angles[1] }
    }
  }
  const ranges: Record<SizerKind, [number, number] | undefined> = {
    mobility: readRange(values['mobility-range'], '--mobility-range', 'nm'),
    aerodynamic: readRange(values['aerodynamic-range'], '--aerodynamic-range', 'um'),
    optical: readRange(values['optical-range'], '--optical-range', 'um')
  }
  const gapRows = values['gap-rows'] ?? 'keep'
  if (gapRows !== 'keep' && gapRows !== 'omit') throw new UsageError(`merge: --gap-rows "${gapRows}" is not keep or omit`)
  const everyGiven = values.every === undefined ? undefined : parseDuration(values.every, '--every')
  const shard = readShard(values.shard, 'merge')

  // pass 1: headers, times, intervals
  const reads: FileRead[] = []
  for (const [kind, path] of files) reads.push(await readTimes(kind, path, density))
  const zoned = reads[0].zoned!
  for (const r of reads.slice(1)) {
    if (r.zoned !== zoned) {
      throw new InputError(`${r.label}`, `its time stamps ${r.zoned ? 'carry a zone' : 'have no zone'} but those of ${reads[0].label} ${zoned ? 'carry one' : 'do not'}, so they cannot be put on one clock`, 'Write the time stamps of every file in the same form (best with their zone, e.g. 2026-06-01T10:05:00Z).')
    }
  }
  const intervals = reads.map((r) => r.interval).filter((v): v is number => v !== undefined)
  const stepMs = everyGiven ?? (intervals.length > 0 ? Math.max(...intervals) : undefined)
  if (stepMs === undefined) throw new UsageError('merge: every file has a single time stamp, so no interval is known; give --every, e.g. --every 10min')
  let first = Infinity
  let last = -Infinity
  for (const r of reads) for (const t of r.times) {
    if (t < first) first = t
    if (t > last) last = t
  }
  const base = regularTimeBase(first, last, stepMs)
  const steps = base.starts.length

  // pass 2: per-step means of dN/dlog d
  const averagers = reads.map((r) => new TimeAverager(base, r.factor.length))
  for (let i = 0; i < reads.length; i++) await accumulate(reads[i], averagers[i])
  const inputs: SizerInput[] = reads.map((r) => ({ kind: r.kind, label: r.label, edgesUm: r.edgesUm, ...(ranges[r.kind] ? { rangeUm: ranges[r.kind]! } : {}) }))
  const means = averagers.map((a) => a.means()) // views into the averagers' sums: no copies

  let densityFit: DensityFit | undefined
  let rho = density
  if (fit) {
    const im = reads.findIndex((r) => r.kind === 'mobility')
    const ia = reads.findIndex((r) => r.kind === 'aerodynamic')
    const pairs: [Float64Array | undefined, Float64Array | undefined][] = []
    for (let k = 0; k < steps; k++) pairs.push([means[im][k], means[ia][k]])
    densityFit = fitDensity(inputs[im], inputs[ia], pairs, { shapeFactor })
    rho = densityFit.density
  }
  const settings: MergeSettings = { shapeFactor, density: rho, binsPerDecade, ...(optical ? { optical } : {}) }
  const plan = planMerge(inputs, settings)

  // the gaps are known before writing, so the rows stream out
  const gapList: string[] = []
  let gapSteps = 0
  for (let k = 0; k < steps; k++) {
    const present = reads.filter((_, i) => means[i][k]).map((r) => r.kind)
    if (present.length === reads.length) continue
    gapSteps++
    if (gapList.length < 20) gapList.push(`${formatTimeStamp(base.starts[k], zoned)}: ${present.length > 0 ? `only ${present.join(' and ')}` : 'no sizer'} had data`)
  }
  const target = await atomicFileOutput(values.out, 'merge')
  const merged = new Float64Array(plan.edges.length - 1)
  try {
    const head = mergedFileHead({
      plan,
      settings,
      stepMs,
      stepChosen: everyGiven !== undefined ? 'given' : 'coarsest interval',
      zoned,
      ...(densityFit ? { densityFit } : {}),
      steps,
      gapSteps,
      gapRows,
      instrumentsColumn: true,
      madeBy: `motebench ${MOTEBENCH_VERSION} merge`
    })
    let preamble = ''
    let [from, to] = [0, steps]
    if (shard) {
      // a shard writes the same head and its contiguous part of the time steps
      ;[from, to] = shardRange(steps, shard)
      const { out: _o, shard: _s, ...options } = values
      preamble = shardLine('merge', shard, await runFingerprint('merge', files.map((f) => f[1]), options), head.length)
    }
    await target.write(preamble + head.join('\n') + '\n')
    let chunk: string[] = []
    for (let k = from; k < to; k++) {
      const vals = reads.map((_, i) => means[i][k])
      const present = reads.filter((_, i) => vals[i]).map((r) => r.kind)
      if (gapRows === 'keep' || present.length === reads.length) {
        mergeStep(plan, vals, merged)
        chunk.push(mergedFileRow(formatTimeStamp(base.starts[k], zoned), merged, present))
      }
      if (chunk.length === 500 || (k === to - 1 && chunk.length > 0)) {
        await target.write(chunk.join('\n') + '\n')
        chunk = []
      }
    }
    await target.commit()
  } catch (e) {
    await target.discard()
    throw e
  }

  // summary on standard error
  const err: string[] = []
  for (const r of reads) {
    err.push(`merge: ${r.label} (${r.kind}): ${r.times.length} record${r.times.length === 1 ? '' : 's'} used, ${r.leftCount} left out; interval ${r.interval !== undefined ? formatDuration(Math.round(r.interval)) : 'unknown (one record)'}`)
    for (const l of r.left.slice(0, 20)) err.push(`  ${r.label} line ${l.line}${l.column !== undefined ? ` column ${l.column}` : ''}: ${l.reason}\n    fix: ${l.fix}`)
    if (r.leftCount > 20) err.push(`  ... and ${r.leftCount - 20} more in ${r.label}`)
  }
  for (const s of plan.sizers) for (const f of s.flagged) err.push(`  ${s.label} bin ${f.bin + 1} flagged by the counter re-binning: ${f.reason}`)
  if (densityFit) {
    err.push(`  density fitted in the overlap (${(densityFit.overlapUm[0] * 1000).toPrecision(4)}–${(densityFit.overlapUm[1] * 1000).toPrecision(4)} nm volume-equivalent): ${densityFit.density.toPrecision(3)} g cm⁻³, misfit (RMS of ln aerodynamic/mobility) ${densityFit.misfit.toPrecision(3)} over ${densityFit.compared} values`)
    if (densityFit.atBound) err.push(`  warning: the fitted density lies at an end of the searched range (0.5 to 5 g cm⁻³): the sizers may not agree for any density; check --shape-factor and the trusted ranges, or give --density`)
  }
  for (const o of plan.overlaps) err.push(`  overlap: ${o.lower} hands over to ${o.upper} from ${(o.fromUm * 1000).toPrecision(4)} to ${(o.toUm * 1000).toPrecision(4)} nm (volume-equivalent)`)
  err.push(`  ${steps} steps of ${formatDuration(stepMs)}${everyGiven === undefined ? ' (the coarsest interval)' : ''}, ${gapRows === 'omit' ? `${steps - gapSteps}` : 'all'} written to ${values.out}; ${plan.edges.length - 1} bins from ${(plan.edges[0] * 1000).toPrecision(4)} to ${(plan.edges[plan.edges.length - 1] * 1000).toPrecision(4)} nm; ${gapSteps} step${gapSteps === 1 ? '' : 's'} with a sizer missing (${gapRows === 'omit' ? 'left out of the table' : 'its bins left empty'})`)
  for (const g of gapList) err.push(`  gap ${g}`)
  if (gapSteps > gapList.length) err.push(`  ... and ${gapSteps - gapList.length} more gap steps`)
  process.stderr.write(err.join('\n') + '\n')
  return reads.some((r) => r.leftCount > 0) ? EXIT_SKIPPED : EXIT_OK
}
