// Bench case `campaign`: the station record's computing (src-core's buildCampaignRecord, which the app runs in a
// worker) on a campaign of MOTEBENCH_BENCH_CAMPAIGN_STEPS (default 100,000) time steps of 100 bins (a year at
// 5 minutes, as one merged size-distribution file) with a nephelometer file (3 wavelengths) and an absorption
// photometer file (3 wavelengths): the time from the files' texts to the record (reading, kernels, every row's
// figures at the charts' wavelengths, as the app's worker asks for them, and the measured alignment), the charts'
// series (recordColumns, the typed arrays they keep), the other wavelengths' figures computed for the CSV export (completeRecord), a stretch of
// a day made into a sample (stretchSample), and the process's peak resident memory. One run each (the record takes seconds); the goal is
// beside each figure. The page's own figures (drawing, zoom, the worker's transfer) are not measured here.
import { availableParallelism, loadavg } from 'node:os'
import { buildCampaignRecord, completeRecord, demoStudy, recordColumns, stretchSample, type CampaignInput } from '../../src-core/index.ts'
import { peakResidentMb, report } from './timing.ts'

const STEPS = Number(process.env['MOTEBENCH_BENCH_CAMPAIGN_STEPS'] ?? 100_000)
const BINS = 100
const STEP_MS = 300_000
const T0 = Date.UTC(2025, 0, 1)
const DIAMETERS_NM = Array.from({ length: BINS }, (_, i) => Number((10 * Math.pow(100, i / (BINS - 1))).toPrecision(6)))

/** Invented smooth rows: an accumulation mode whose median and number drift through the days. */
function sizerText(): string {
  const lines = ['units: nm', 'quantity: dN/dlogDp', 'diameters: midpoints', ['time', ...DIAMETERS_NM].join(',')]
  for (let i = 0; i < STEPS; i++) {
    const median = 80 + 40 * Math.sin(i / 50)
    const n = 4000 + 2000 * Math.cos(i / 70)
    lines.push([new Date(T0 + i * STEP_MS).toISOString().replace('.000Z', 'Z'), ...DIAMETERS_NM.map((d) => Number((n * Math.exp(-0.5 * (Math.log(d / median) / Math.log(1.7)) ** 2)).toPrecision(5)))].join(','))
  }
  return lines.join('\n') + '\n'
}

function opticalText(head: string, f: (i: number) => number[]): string {
  const lines = ['# units: Mm-1', head]
  for (let i = 0; i < STEPS; i++) lines.push([new Date(T0 + i * STEP_MS + 30_000).toISOString().replace('.000Z', 'Z'), ...f(i).map((v) => v.toPrecision(4))].join(','))
  return lines.join('\n') + '\n'
}

export async function benchCampaign(): Promise<void> {
  const inputs: CampaignInput[] = [
    { kind: 'merged', name: 'bench-merged.csv', text: sizerText() },
    { kind: 'scattering', name: 'bench-neph.csv', text: opticalText('time,scattering 450 nm,scattering 550 nm,scattering 700 nm', (i) => [60, 45, 30].map((v) => v * (1 + 0.3 * Math.sin(i / 60)))) },
    { kind: 'absorption', name: 'bench-abs.csv', text: opticalText('time,absorption 370 nm,absorption 520 nm,absorption 880 nm', (i) => [9, 6, 3.5].map((v) => v * (1 + 0.3 * Math.cos(i / 60)))) }
  ]
  const textMb = inputs.reduce((s, x) => s + x.text.length, 0) / 1e6
  const study = demoStudy()
  const t0 = performance.now()
  const cpu0 = process.cpuUsage()
  const build = buildCampaignRecord(inputs, { files: [], sample: study.samples[0].name, wavelength_nm: 550, shape_factor: 1 }, study, { figures: 'charts' })
  const recordMs = performance.now() - t0
  const cpu = process.cpuUsage(cpu0)
  const r = build.record!
  const t1 = performance.now()
  recordColumns(r)
  const seriesMs = performance.now() - t1
  const from = r.times[Math.floor(r.times.length / 2)]
  const t2 = performance.now()
  const s = stretchSample(r, from, from + 86_400_000)
  const sampleMs = performance.now() - t2
  const t3 = performance.now()
  const figuresAt = r.figuresNm.length
  completeRecord(r)
  const completeMs = performance.now() - t3
  report('campaign', {
    steps: r.times.length,
    bins: r.bins,
    input_mb: Number(textMb.toFixed(1)),
    record_s: Number((recordMs / 1000).toFixed(2)),
    record_goal_s: 5,
    // the process's processor time meanwhile (this thread and V8's helpers): steadier than the wall clock on a shared machine
    record_cpu_s: Number(((cpu.user + cpu.system) / 1e6).toFixed(2)),
    series_ms: Math.round(seriesMs),
    figures_at: `${figuresAt} of ${r.wavelengthsNm.length} wavelengths`,
    export_complete_s: Number((completeMs / 1000).toFixed(2)),
    stretch_rows: s.rows,
    stretch_ms: Number(sampleMs.toFixed(1)),
    stretch_goal_ms: 300,
    peak_rss_mb: Math.round(peakResidentMb()),
    memory_goal_mb: 1024,
    note: 'src-core on this thread, as the page worker runs it; drawing and the transfer to the page not included',
    cores: availableParallelism(),
    load: Number(loadavg()[0].toFixed(2))
  })
}
