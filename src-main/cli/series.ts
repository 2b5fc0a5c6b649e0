// motebench series SIZER --study FILE --sample NAME: one row of optics per time step of a sizer time series.
// This module reads the arguments, the study and the file's header, and writes the summary; the rows go through
// the pipeline in series-pipeline.ts (worker threads, blocks, output in input order).
import { stat } from 'node:fs/promises'
import { availableParallelism } from 'node:os'
import { basename } from 'node:path'
import { dryIndicesAt, resolveComposition, studyMaterials } from '../../src-core/index.ts'
import { loadStudyFile } from '../files.ts'
import { atomicFileOutput, EXIT_OK, EXIT_SKIPPED, findSample, readArgs, readTolerance, readWavelengthsNm, UsageError } from './common.ts'
import { skippingFileLines } from './file-lines.ts'
import { lineIndex, readShard, runFingerprint, shardLine, shardRange, type LineIndex } from './shard.ts'
import { readingLines, readSizerFlags, sizerFlags, sizerHelp } from './sizer-options.ts'
import { seriesWorkerCount } from './series-early.ts'
import { kernelSourceLine } from './kernel-cache.ts'
import { prepareSeriesOptical, SERIES_OPTICAL_OPTIONS, seriesOpticalHelp } from './series-optical.ts'
import { runSeriesPipeline, type SeriesOutput, type SeriesRunOptions, type SeriesSummary } from './series-pipeline.ts'

export { runSeriesPipeline } from './series-pipeline.ts'

export const seriesHelp = `motebench series SIZER --study FILE.mote --sample NAME: optics of every distribution of a sizer time series
  SIZER                 sizer export with one row per time and one column per bin (.csv, .tsv or .txt)
  --study FILE          study whose sample gives composition, humidity and layer
  --sample NAME         that sample (its size distribution is replaced by each row's bins)
  --wavelengths LIST    e.g. 450,550,700 (nm) or 0.45,0.55um (default: the study's wavelengths)
  --out FILE            write the CSV to FILE (it appears only when complete) instead of standard output
  --on-bad-row P        skip (default: leave bad rows out, list them, exit status 1) or stop (at the first, exit 2;
                        with --out no file, on standard output the rows before it)
  --workers N           worker threads that compute the rows while the main thread reads the file (default:
                        one fewer than the processors, at least 1: ${Math.max(1, availableParallelism() - 1)} here)
  --tolerance T         relative accuracy of each bin's size integration (default 1e-4); the bins are
                        integrated once and every row is a weighted sum of them. These bin kernels are kept
                        for later runs with the same composition, humidity, wavelengths, bins and tolerance
                        (the same numbers, read instead of integrated): in $MOTEBENCH_CACHE_DIR, else
                        $XDG_CACHE_HOME/motebench or ~/.cache/motebench; MOTEBENCH_CACHE_DIR=off keeps none
                        (the measured instruments' kernels, with --scattering or --absorption, are kept too)
${sizerHelp()}
${seriesOpticalHelp}
  --shard K/N           only the K-th of N contiguous parts of the file's lines (rows in one time per row
                        files); the output starts with a shard line, and "motebench join" puts the parts together
                        (with --scattering or --absorption every part reads those files and the sizer's times whole)
Output: CSV with time (ISO 8601; a label as written when the file's time column holds no dates), then per wavelength ext, sca, abs (Mm⁻¹), ssa, g, then dry number (cm⁻³), volume
(µm³ cm⁻³) and mass (µg m⁻³); with measured files, their columns after these (the "#" lines that open the
file say how they were made comparable). A summary goes to standard error; a progress bar too when it is a terminal.
Exit status 0, 1 when rows were skipped (of the sizer file or of an instrument file), 2 for bad input.`

const stdoutOutput: SeriesOutput = {
  write: (text) =>
    new Promise((resolve, reject) => {
      const ok = process.stdout.write(text, (e) => (e ? reject(e) : undefined))
      if (ok) resolve()
      else process.stdout.once('drain', () => resolve())
    })
}

/** A progress bar on standard error: the share of the file read, and the rows written (only on a terminal). */
function progressBar(total: number, bytesRead: () => number) {
  let written = 0
  const render = () => {
    const f = total > 0 ? Math.min(1, bytesRead() / total) : 0
    const width = 30
    const full = Math.round(f * width)
    process.stderr.write(`\r[${'#'.repeat(full)}${'.'.repeat(width - full)}] ${(f * 100).toFixed(0).padStart(3)}% read, ${written} rows written`)
  }
  const timer = setInterval(render, 250)
  timer.unref()
  return {
    update(n: number) {
      written = n
    },
    clear() {
      clearInterval(timer)
      process.stderr.write('\r\x1b[K')
    }
  }
}

function summaryText(file: string, s: SeriesSummary, out: string | undefined, wavelengths: number): string {
  const skipped = s.rowsSkippedByReader + s.rowsSkippedByOptics
  const lines = [
    `series: ${file}: ${s.distributionsRead} row${s.distributionsRead === 1 ? '' : 's'} read, ${s.rowsWritten} written${out ? ` to ${out}` : ''}, ${skipped} skipped` +
      (skipped > 0 ? ` (${s.rowsSkippedByReader} with bad cells, ${s.rowsSkippedByOptics} whose distribution the optics could not use)` : ''),
    `  ${s.header.diameters.length - (s.header.edges ? 1 : 0)} bins (${s.header.quantity}), ${wavelengths} wavelength${wavelengths === 1 ? '' : 's'}; size-integration tolerance ${s.tolerance} (relative); ${s.workers} worker${s.workers === 1 ? '' : 's'}; ${s.seconds.toFixed(1)} s`
  ]
  const kernels = kernelSourceLine('bin kernels', s.kernels)
  if (kernels) lines.push(`  ${kernels}`)
  for (const l of readingLines({ ...s.header, negativesZeroed: s.negativesZeroed })) lines.push(`  ${l}`)
  const show = s.skipped.slice(0, 20)
  for (const r of show) lines.push(`  line ${r.line}${r.column !== undefined ? ` column ${r.column}` : ''}: ${r.reason}${r.fix ? `\n    fix: ${r.fix}` : ''}`)
  if (s.skipped.length > show.length) lines.push(`  ... and ${s.skipped.length - show.length} more reasons not shown`)
  return lines.join('\n') + '\n'
}

export async function runSeries(argv: string[]): Promise<number> {
  const { values, positionals } = readArgs(
    'series',
    argv,
    {
      study: { type: 'string' },
      sample: { type: 'string' },
      wavelengths: { type: 'string' },
      out: { type: 'string' },
      'on-bad-row': { type: 'string' },
      workers: { type: 'string' },
      tolerance: { type: 'string' },
      ...sizerFlags,
      ...SERIES_OPTICAL_OPTIONS,
      shard: { type: 'string' }
    },
    true
  )
  if (positionals.length !== 1) throw new UsageError('series: give one sizer file, for example "motebench series sizer.csv --study demo.mote --sample NAME"')
  const file = positionals[0]
  if (values.study === undefined) throw new UsageError('series: --study is required, for example --study demo.mote (the sample gives composition, humidity and layer)')
  if (values.sample === undefined) throw new UsageError('series: --sample is required: the name of a sample of the study')
  const policy = values['on-bad-row'] ?? 'skip'
  if (policy !== 'skip' && policy !== 'stop') throw new UsageError(`series: --on-bad-row "${policy}" is not skip or stop`)
  const workers = seriesWorkerCount(values.workers)
  const tolerance = readTolerance(values.tolerance, 1e-4)
  const sizer: SeriesRunOptions['sizer'] = readSizerFlags('series', values)


  const { study } = await loadStudyFile(values.study)
  const { sample } = findSample(study, values.sample, 'series')
  let wavelengthsNm = values.wavelengths !== undefined ? readWavelengthsNm(values.wavelengths) : study.wavelengths_nm.slice()
  const userMaterials = study.user_materials ?? []
  // Measured optical instruments beside the sizer: read and averaged onto the sizer rows before the run; the
  // figures are computed at their wavelengths too.
  const optical = await prepareSeriesOptical(values, { sizerPath: file, sizer, sample, userMaterials, tolerance })
  if (optical) wavelengthsNm = [...new Set([...wavelengthsNm, ...optical.wavelengthsNm])].sort((a, b) => a - b)
  // Check the composition at every wavelength here, so a bad one is one clear message rather than one per row.
  const own = studyMaterials({ user_materials: userMaterials, wavelengths_nm: wavelengthsNm })
  const kind = resolveComposition(sample.composition, own, `sample "${sample.name}"`)
  for (const w of wavelengthsNm) dryIndicesAt(kind, w / 1000)

  const size = (await stat(file)).size
  const shardOf = readShard(values.shard, 'series')
  let shard: SeriesRunOptions['shard']
  let index: LineIndex | undefined
  if (shardOf) {
    index = await lineIndex(file)
    const [from, to] = shardRange(index.total, shardOf)
    // with measured instruments every part reads them whole and the sizer's times (the time base), so a row's
    // measured cells and the head's notes are the single run's; the files and the options that change them count
    const measured = [values.scattering, values.absorption].filter((f): f is string => f !== undefined)
    const opticalOptions = optical ? { scattering: values.scattering !== undefined, absorption: values.absorption !== undefined, truncation: values.truncation, angles: values['neph-angles'], closure: values.closure, closureSd: values['closure-sd'] } : undefined
    const options = { sample: sample.name, wavelengthsNm, tolerance, sizer, policy, ...(opticalOptions ? { optical: opticalOptions } : {}) }
    const head = 1 + (optical?.extra.headerComments ?? []).reduce((n, c) => n + c.split('\n').length, 0)
    // the last part takes every line after its first (whatever the count missed)
    shard = { firstLine: from + 1, lastLine: shardOf.k === shardOf.n ? Infinity : to, line: shardLine('series', shardOf, await runFingerprint('series', [file, values.study, ...measured], options), head) }
  }
  const target = values.out !== undefined ? await atomicFileOutput(values.out, 'series') : undefined
  const lines = skippingFileLines(file, index?.offsetOf)
  const bar = process.stderr.isTTY ? progressBar(size, () => lines.bytesRead) : undefined
  let summary: SeriesSummary
  try {
    summary = await runSeriesPipeline({
      sample,
      userMaterials,
      wavelengthsNm,
      tolerance,
      lines,
      fileName: basename(file),
      sizer,
      onBadRow: policy,
      workers,
      output: target ?? stdoutOutput,
      extra: optical?.extra,
      onProgress: bar ? (n) => bar.update(n) : undefined,
      shard
    })
    await target?.commit()
  } catch (e) {
    await target?.discard()
    throw e
  } finally {
    bar?.clear()
    await lines.close()
  }
  const part = shardOf && shard && index ? `  shard ${shardOf.k}/${shardOf.n}: lines ${shard.firstLine}–${Math.min(shard.lastLine, index.total)} of ${index.total}${summary.linesSkipped > 0 ? `; lines ${shard.firstLine - summary.linesSkipped}–${shard.firstLine - 1} skipped unread (the table is read from the file's first lines)` : ''}\n` : ''
  process.stderr.write(summaryText(file, summary, values.out, wavelengthsNm.length) + part + (optical ? optical.extra.summary().join('\n') + '\n' : ''))
  return summary.rowsSkippedByReader + summary.rowsSkippedByOptics + (optical?.extra.rowsLeftOut ?? 0) > 0 ? EXIT_SKIPPED : EXIT_OK
}

