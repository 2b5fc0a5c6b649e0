// Bench case `series`: `motebench series` end to end, as a user runs it: the built CLI (out/cli, built first here)
// in its own process on a generated sizer file of 20,000 distributions of 100 bins at 3 wavelengths (15 MB), writing
// its CSV to a file. Reports rows per second of the whole process and its peak resident memory (worker threads
// included), median of three runs, with the bins' kernels integrated in the run (the first run on a bin layout;
// MOTEBENCH_CACHE_DIR=off) and, as `kernels_kept_*`, read from those an earlier run kept (src-main/cli/
// kernel-cache.ts: later files of the same sizer); the same on a quarter of the rows, to show how memory goes with
// the rows and what a row costs beyond the fixed start (process, worker threads, the bins' kernels); and, on this
// thread, the one-off integration of the kernels and a row's figures and CSV line (in a 256-row block). Also the
// invented campaign's 840 rows with a nephelometer (truncation corrected) and an absorption file, the instruments'
// kernels integrated and kept (`instruments_campaign_*`).
// MOTEBENCH_BENCH_SERIES_ROWS sets another number of rows (e.g. for a quick look). Then a long file, 5 times the
// rows (100,000, 73 MB; MOTEBENCH_BENCH_SERIES_LONG_ROWS, 0 for none), as a monitoring network's record: its rows per
// second end to end and its peak memory (it rises from the quarter's to the long file's and then levels off:
// 90, 103, 125 MB, and 131 MB at 200,000 rows, on 2026-12-05). The timed processes run without NODE_EXTRA_CA_CERTS
// (timing.ts).
import { execFileSync, spawnSync } from 'node:child_process'
import { createWriteStream, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { availableParallelism, loadavg, tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { demoStudy } from '../../src-core/index.ts'
import { SeriesBlockComputer, type BinLayout } from '../../src-main/cli/series-row.ts'
import { envLeftOut, median, msPerRun, report, timedEnv } from './timing.ts'

const BINS = 100
const WAVELENGTHS_NM = [450, 550, 700]
const RUNS = 3
const root = fileURLToPath(new URL('../../', import.meta.url))

/** Bin midpoints 10 nm to 1 µm, log-spaced. */
const DIAMETERS_NM = Array.from({ length: BINS }, (_, i) => Number((10 * Math.pow(100, i / (BINS - 1))).toPrecision(6)))

/** Row i: an accumulation mode whose median and number drift through the day (invented, smooth). */
function rowValues(i: number): number[] {
  const median = 80 + 40 * Math.sin(i / 50)
  const n = 4000 + 2000 * Math.cos(i / 70)
  return DIAMETERS_NM.map((d) => Number((n * Math.exp(-0.5 * (Math.log(d / median) / Math.log(1.7)) ** 2)).toPrecision(5)))
}

/** Writes the sizer file (one row per minute from 2024-01-01). */
async function writeSizerFile(path: string, rows: number): Promise<void> {
  const out = createWriteStream(path)
  const put = (line: string) => (out.write(line + '\n') ? undefined : new Promise<void>((r) => out.once('drain', () => r())))
  await put('units: nm')
  await put('quantity: dN/dlogDp')
  await put(['time', ...DIAMETERS_NM].join(','))
  const t0 = Date.UTC(2024, 0, 1)
  for (let i = 0; i < rows; i++) await put([new Date(t0 + i * 60_000).toISOString(), ...rowValues(i)].join(','))
  await new Promise<void>((resolve, reject) => out.end((e?: Error | null) => (e ? reject(e) : resolve())))
}

/**
 * Runs in the CLI's process: its peak resident memory (worker threads included) on standard error at exit, read as
 * peakResidentMb (timing.ts) reads it: VmHWM, not maxRSS, which counts this bench process's memory too.
 */
const MEASURE = `
import { readFileSync } from 'node:fs'
import { pathToFileURL } from 'node:url'
const [node, , bin, ...args] = process.argv
process.argv = [node, bin, ...args]
const peakKb = () => {
  try {
    const m = /VmHWM:\\s*(\\d+)\\s*kB/.exec(readFileSync('/proc/self/status', 'utf8'))
    if (m) return Number(m[1])
  } catch {}
  return process.resourceUsage().maxRSS
}
process.on('exit', () => process.stderr.write('\\npeak-rss-kb ' + peakKb() + '\\n'))
await import(pathToFileURL(bin).href)
`

/**
 * One timed run. `cache`: the folder where the bins' kernels are kept between runs (src-main/cli/kernel-cache.ts),
 * or 'off': integrated in the run, as on the first run on a bin layout.
 */
function runCli(dir: string, file: string, cache: string, seriesArgs = ['--sample', 'Coastal haze day', '--wavelengths', WAVELENGTHS_NM.join(',')]): { seconds: number; peakMb: number } {
  const args = [join(dir, 'measure.mjs'), join(root, 'bin/motebench.mjs'), 'series', file, '--study', join(root, 'resources/demo.mote'), ...seriesArgs, '--out', join(dir, 'out.csv')]
  const t0 = performance.now()
  const r = spawnSync(process.execPath, args, { encoding: 'utf8', env: { ...timedEnv(), MOTEBENCH_CACHE_DIR: cache } })
  const seconds = (performance.now() - t0) / 1000
  const m = /peak-rss-kb (\d+)/.exec(r.stderr)
  if (r.status === null || r.status > 1 || !m) throw new Error(`motebench series failed: ${r.stderr}`)
  return { seconds, peakMb: Number(m[1]) / 1024 }
}

export async function benchSeries(): Promise<void> {
  const rows = Number(process.env.MOTEBENCH_BENCH_SERIES_ROWS ?? 20_000)
  const quarter = Math.max(1, Math.round(rows / 4))
  execFileSync(process.execPath, [join(root, 'scripts/build-cli.mjs')], { stdio: 'ignore' })
  const dir = mkdtempSync(join(tmpdir(), 'motebench-bench-series-'))
  try {
    writeFileSync(join(dir, 'measure.mjs'), MEASURE)
    const full = join(dir, 'full.csv')
    const small = join(dir, 'quarter.csv')
    await writeSizerFile(full, rows)
    await writeSizerFile(small, quarter)
    const big: { seconds: number; peakMb: number }[] = []
    const little: { seconds: number; peakMb: number }[] = []
    // the kernels integrated in every run (the first run on a layout), and read from those an earlier run kept
    // (the next day's file of the same sizer): the cache filled by an untimed run first
    const kept: { seconds: number; peakMb: number }[] = []
    const cache = join(dir, 'kernels')
    runCli(dir, small, cache)
    for (let r = 0; r < RUNS; r++) {
      big.push(runCli(dir, full, 'off'))
      little.push(runCli(dir, small, 'off'))
      kept.push(runCli(dir, full, cache))
    }
    const tKept = median(kept.map((x) => x.seconds))
    const tBig = median(big.map((x) => x.seconds))
    const tSmall = median(little.map((x) => x.seconds))
    const longRows = Number(process.env.MOTEBENCH_BENCH_SERIES_LONG_ROWS ?? 5 * rows)
    const long: { seconds: number; peakMb: number }[] = []
    if (longRows > 0) {
      const file = join(dir, 'long.csv')
      await writeSizerFile(file, longRows)
      for (let r = 0; r < RUNS; r++) long.push(runCli(dir, file, 'off'))
      rmSync(file)
    }

    // The invented campaign's sizer with its nephelometer (truncation corrected) and absorption files: the
    // instruments' kernels (each bin's phase function on the nephelometer's angles) integrated, and kept (exit
    // status 1: the files' few bad rows are left out)
    const field = (f: string) => join(root, 'resources/field', f)
    const withInstruments = ['--sample', 'Winter wood smoke', '--wavelengths', '550', '--scattering', field('campaign-nephelometer.csv'), '--absorption', field('campaign-absorption.csv'), '--truncation']
    const instrumentsCache = join(dir, 'instrument-kernels')
    runCli(dir, field('campaign-mobility.csv'), instrumentsCache, withInstruments)
    const instruments: number[] = []
    const instrumentsKept: number[] = []
    for (let r = 0; r < RUNS; r++) {
      instruments.push(runCli(dir, field('campaign-mobility.csv'), 'off', withInstruments).seconds)
      instrumentsKept.push(runCli(dir, field('campaign-mobility.csv'), instrumentsCache, withInstruments).seconds)
    }

    // On this thread, without threads or I/O: the bins' kernels (once per series), then a 256-row block's figures and lines, per row.
    const study = demoStudy()
    const sample = study.samples.find((s) => s.name === 'Coastal haze day') ?? study.samples[0]
    const computer = new SeriesBlockComputer({ sample, userMaterials: study.user_materials ?? [], wavelengthsNm: WAVELENGTHS_NM, tolerance: 1e-4 })
    const layout: BinLayout = { diameters: DIAMETERS_NM, diameter_unit: 'nm', edges: false, quantity: 'dN/dlogDp' }
    const k0 = performance.now()
    computer.useLayout(layout)
    const kernelMs = performance.now() - k0
    // a block of 256 rows, as the pipeline sends them (one row alone measured the block's set-up and a cold JIT)
    const BLOCK = 256
    const block = new Float64Array(BLOCK * BINS)
    for (let r = 0; r < BLOCK; r++) block.set(rowValues(r), r * BINS)
    const stamps = Array.from({ length: BLOCK }, (_, r) => new Date(Date.UTC(2024, 0, 1) + r * 60_000).toISOString())
    const rowMs = msPerRun(() => void computer.block(stamps, block, BINS), 15) / BLOCK

    report('series', {
      rows,
      bins: BINS,
      wavelengths: WAVELENGTHS_NM.length,
      workers: Math.max(1, availableParallelism() - 1),
      whole_process_s: Number(tBig.toFixed(2)),
      rows_per_second: Number((rows / tBig).toPrecision(3)),
      goal_rows_per_second: '>= 50000',
      peak_rss_mb: Number(median(big.map((x) => x.peakMb)).toFixed(0)),
      goal_peak_rss_mb: '<= 300, flat in the rows',
      kernels_kept_whole_process_s: Number(tKept.toFixed(2)),
      kernels_kept_rows_per_second: Number((rows / tKept).toPrecision(3)),
      quarter_rows_peak_rss_mb: Number(median(little.map((x) => x.peakMb)).toFixed(0)),
      quarter_rows_whole_process_s: Number(tSmall.toFixed(2)),
      rows_per_second_beyond_start: Number(((rows - quarter) / Math.max(1e-9, tBig - tSmall)).toPrecision(3)),
      ...(long.length
        ? {
            long_rows: longRows,
            long_whole_process_s: Number(median(long.map((x) => x.seconds)).toFixed(2)),
            long_rows_per_second: Number((longRows / median(long.map((x) => x.seconds))).toPrecision(3)),
            long_peak_rss_mb: Number(median(long.map((x) => x.peakMb)).toFixed(0))
          }
        : {}),
      instruments_campaign_whole_process_s: Number(median(instruments).toFixed(2)),
      instruments_campaign_kernels_kept_s: Number(median(instrumentsKept).toFixed(2)),
      kernel_setup_ms: Math.round(kernelMs),
      one_row_us_single_thread: Number((rowMs * 1000).toPrecision(3)),
      load_average_1min: Number(loadavg()[0].toFixed(2)),
      ...envLeftOut()
    })
  } finally {
    rmSync(dir, { recursive: true, force: true })
  }
}
