// Bench case `sizer-read`: the field-data reader alone (createSizerReader, no file I/O, no optics) on a
// generated export of 20,000 rows × 100 bins, in two layouts: ISO 8601 times with decimal points, and a
// tab-separated export with sample number, day/month/year date and time columns and trailing totals. Reports
// rows per second (median of five passes after three warm-up passes), per second of
// wall-clock time and per second of processor time, beside the goal: the reader must leave room for `series` to reach
// 50,000 rows/s end to end (issue 19), so it aims at 100,000 rows/s on its own (half the budget of a row).
// On a machine shared with other work the processor-time figure is the one to read.
import { createSizerReader } from '../../src-core/index.ts'
import { median, report } from './timing.ts'

const ROWS = 20_000
const BINS = 100
const DIAMETERS_NM = Array.from({ length: BINS }, (_, i) => Number((10 * Math.pow(100, i / (BINS - 1))).toPrecision(6)))

function values(i: number): string[] {
  const median = 80 + 40 * Math.sin(i / 50)
  return DIAMETERS_NM.map((d) => (4000 * Math.exp(-0.5 * (Math.log(d / median) / Math.log(1.7)) ** 2)).toPrecision(5))
}

function isoFile(): string[] {
  const lines = ['units: nm', 'quantity: dN/dlogDp', ['time', ...DIAMETERS_NM].join(',')]
  const t0 = Date.UTC(2024, 0, 1)
  for (let i = 0; i < ROWS; i++) lines.push([new Date(t0 + i * 300_000).toISOString(), ...values(i)].join(','))
  return lines
}

function tabFile(): string[] {
  const lines = ['# valley mobility sizer (fictional)', 'quantity: dN/dlogDp', ['Sample', 'Date', 'Time', ...DIAMETERS_NM.map((d) => `${d} nm`), 'Total', 'Median', 'Mean'].join('\t')]
  const t0 = Date.UTC(2024, 0, 1)
  for (let i = 0; i < ROWS; i++) {
    const t = new Date(t0 + i * 300_000).toISOString()
    lines.push([String(i + 1), `${t.slice(8, 10)}/${t.slice(5, 7)}/${t.slice(0, 4)}`, t.slice(11, 19), ...values(i), '5000', '81.2', '95.3'].join('\t'))
  }
  return lines
}

/** Rows per second of wall-clock time and of this process's processor time (less disturbed on a busy machine). */
function rowsPerSecond(lines: string[]): { wall: number; cpu: number } {
  const wall: number[] = []
  const cpu: number[] = []
  for (let pass = 0; pass < 8; pass++) {
    let n = 0
    const start = performance.now()
    const c0 = process.cpuUsage()
    const reader = createSizerReader({ onRecord: () => void n++ })
    for (const l of lines) reader.push(l)
    reader.end()
    const c = process.cpuUsage(c0)
    const s = (performance.now() - start) / 1000
    if (n !== ROWS) throw new Error(`read ${n} rows of ${ROWS}`)
    if (pass >= 3) {
      wall.push(ROWS / s)
      cpu.push(ROWS / ((c.user + c.system) / 1e6))
    }
  }
  return { wall: Math.round(median(wall)), cpu: Math.round(median(cpu)) }
}

export function benchSizerRead(): void {
  const iso = rowsPerSecond(isoFile())
  const tab = rowsPerSecond(tabFile())
  report('sizer-read', {
    rows: ROWS,
    bins: BINS,
    iso_comma_rows_per_s: iso.wall,
    iso_comma_rows_per_cpu_s: iso.cpu,
    tab_date_time_rows_per_s: tab.wall,
    tab_date_time_rows_per_cpu_s: tab.cpu,
    goal_rows_per_s: 100_000
  })
}
