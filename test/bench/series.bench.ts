// Bench case `series`: the `motebench series` machinery (streamed reading, worker threads, ordered output) on a
// generated record of 10,000 distributions of 100 bins at 3 wavelengths. Reports rows per second and the peak
// resident memory sampled during the run (worker threads share the process, so it includes them), and, to show
// where the cost lies, the one-off integration of the bins' kernels and one row's dot products, on this thread.
// MOTEBENCH_BENCH_SERIES_ROWS sets another number of rows (e.g. for a quick look).
import { availableParallelism } from 'node:os'
import { demoStudy } from '../../src-core/index.ts'
import { runSeriesPipeline } from '../../src-main/cli/series.ts'
import { SeriesBlockComputer, type BinLayout } from '../../src-main/cli/series-row.ts'
import { msPerRun, report } from './timing.ts'

const BINS = 100
const WAVELENGTHS_NM = [450, 550, 700]

/** Bin midpoints 10 nm to 1 µm, log-spaced. */
const DIAMETERS_NM = Array.from({ length: BINS }, (_, i) => Number((10 * Math.pow(100, i / (BINS - 1))).toPrecision(6)))

/** Row i: an accumulation mode whose median and number drift through the day (invented, smooth). */
function rowValues(i: number): number[] {
  const median = 80 + 40 * Math.sin(i / 50)
  const n = 4000 + 2000 * Math.cos(i / 70)
  return DIAMETERS_NM.map((d) => Number((n * Math.exp(-0.5 * (Math.log(d / median) / Math.log(1.7)) ** 2)).toPrecision(5)))
}

/** The sizer file's lines, made one at a time (nothing held in memory). */
async function* sizerLines(rows: number): AsyncGenerator<string> {
  yield 'units: nm'
  yield 'quantity: dN/dlogDp'
  yield ['time', ...DIAMETERS_NM].join(',')
  const t0 = Date.UTC(2024, 0, 1)
  for (let i = 0; i < rows; i++) yield [new Date(t0 + i * 60_000).toISOString(), ...rowValues(i)].join(',')
}

export async function benchSeries(): Promise<void> {
  const rows = Number(process.env.MOTEBENCH_BENCH_SERIES_ROWS ?? 10_000)
  const study = demoStudy()
  const sample = study.samples.find((s) => s.name === 'Coastal haze day') ?? study.samples[0]
  const setup = { sample, userMaterials: study.user_materials ?? [], wavelengthsNm: WAVELENGTHS_NM, tolerance: 1e-4 }

  // On this thread, without threads or I/O: the bins' kernels (once per series), then one row.
  const bins: BinLayout = { diameters: DIAMETERS_NM, diameter_unit: 'nm', edges: false, quantity: 'dN/dlogDp' }
  const computer = new SeriesBlockComputer(setup)
  const k0 = performance.now()
  computer.useLayout(bins)
  const kernelMs = performance.now() - k0
  // one row's dot products and its CSV line (a block of one), values made beforehand
  const row = Float64Array.from(rowValues(1))
  const rowMs = msPerRun(() => void computer.block(['2024-01-01T00:00:00.000Z'], row, BINS), 15)

  const rssMb = () => process.memoryUsage.rss() / 2 ** 20
  const rssStart = rssMb()
  let peak = rssStart
  let bytes = 0
  // resident memory when a tenth and nine tenths of the rows are written: flat memory makes them equal
  let rssTenth = NaN
  let rssNineTenths = NaN
  const workers = Math.max(1, availableParallelism() - 1)
  const t0 = performance.now()
  const summary = await runSeriesPipeline({
    ...setup,
    lines: sizerLines(rows),
    fileName: 'generated.csv',
    onBadRow: 'stop',
    workers,
    output: { write: async (text) => void (bytes += text.length) },
    onProgress: (written) => {
      if (Number.isNaN(rssTenth) && written >= rows / 10) rssTenth = rssMb()
      if (Number.isNaN(rssNineTenths) && written >= (9 * rows) / 10) rssNineTenths = rssMb()
    },
    onTick: () => void (peak = Math.max(peak, rssMb()))
  })
  const seconds = (performance.now() - t0) / 1000
  peak = Math.max(peak, rssMb())
  report('series', {
    rows: summary.rowsWritten,
    bins: BINS,
    wavelengths: WAVELENGTHS_NM.length,
    workers,
    rows_per_second: Number((summary.rowsWritten / seconds).toPrecision(4)),
    peak_rss_mb: Number(peak.toFixed(1)),
    rss_start_mb: Number(rssStart.toFixed(1)),
    rss_at_10pct_mb: Number(rssTenth.toFixed(1)),
    rss_at_90pct_mb: Number(rssNineTenths.toFixed(1)),
    rss_end_mb: Number(rssMb().toFixed(1)),
    output_mb: Number((bytes / 2 ** 20).toFixed(2)),
    kernel_setup_ms: Math.round(kernelMs),
    one_row_us_single_thread: Number((rowMs * 1000).toPrecision(3))
  })
}
