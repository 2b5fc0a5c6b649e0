// motebench closure: the effective refractive index that makes a measured size distribution reproduce measured
// scattering and absorption coefficients.
import { readFile } from 'node:fs/promises'
import { basename } from 'node:path'
import { parseSizerText, retrieveRefractiveIndex, sizerRecordToBins, type ClosureMeasurement, type ClosureResult } from '../../src-core/index.ts'
import { formatNumber, printJson, printTable, readArgs, readNumber, readPair, UsageError } from './common.ts'
import { readSizerFlags, sizerFlags, sizerHelp } from './sizer-options.ts'

export const closureHelp = `motebench closure: effective refractive index n + ik from a size distribution and optical measurements
  --sizer FILE          a sizer export with one distribution (.csv, .tsv or .txt; see "motebench check")
  --sca LIST            scattering coefficients, Mm⁻¹: WAVELENGTH_NM:VALUE±SD, comma-separated,
                        e.g. 450:21.3±1.0,550:15.2±0.8 ("+-" may stand for "±")
  --abs LIST            absorption coefficients, Mm⁻¹, same form, e.g. 530:3.1±0.4
  --bsf LIST            hemispheric backscatter fractions, e.g. 550:0.12±0.01 (optional)
  --n-range LO:HI       real index searched (default 1.3:1.8)
  --k-range LO:HI       imaginary index searched (default 0:1)
${sizerHelp('sizer file: ')}
  --json                JSON output (includes the χ² grid)
The particles are taken as measured (dry, homogeneous spheres) with one index at every wavelength. The fit is
weighted least squares: a grid scan over n and log k, then Levenberg–Marquardt; uncertainties (1 sd) come
from the curvature of χ². Every separate minimum within Δχ² = 2.3 of the best is reported, with a warning.`

/** "450:21.3±1.0,550:15.2+-0.8" → measurements. */
export function readMeasurements(text: string, flag: string): ClosureMeasurement[] {
  return text.split(',').map((item) => {
    const m = /^\s*([^:]+):\s*([^±]+?)\s*(?:±|\+-|\+\/-)\s*(.+?)\s*$/.exec(item)
    if (!m) throw new UsageError(`${flag}: "${item}" is not WAVELENGTH_NM:VALUE±SD, e.g. 550:15.2±0.8`)
    return { wavelength_nm: readNumber(m[1], flag), value: readNumber(m[2], flag), sd: readNumber(m[3], flag) }
  })
}

function readRange(text: string | undefined, flag: string, fallback: [number, number]): [number, number] {
  return text === undefined ? fallback : readPair(text, { command: 'closure', flag, form: 'LO:HI', example: flag === '--n-range' ? '1.3:1.8' : '0:1' })
}

export async function runClosure(argv: string[]): Promise<number> {
  const { values } = readArgs('closure', argv, {
    sizer: { type: 'string' },
    sca: { type: 'string' },
    abs: { type: 'string' },
    bsf: { type: 'string' },
    'n-range': { type: 'string' },
    'k-range': { type: 'string' },
    ...sizerFlags,
    json: { type: 'boolean', default: false }
  })
  if (values.sizer === undefined) throw new UsageError('closure: --sizer is required, for example --sizer resources/sizer-single-comma.csv')
  if (values.sca === undefined && values.abs === undefined) throw new UsageError('closure: give --sca and/or --abs, for example --sca 550:15.2±0.8 --abs 530:3.1±0.4')
  const table = parseSizerText(await readFile(values.sizer, 'utf8'), { ...readSizerFlags('closure', values), fileName: basename(values.sizer), onBadRow: 'stop' })
  if (table.records.length !== 1) throw new UsageError(`closure: ${basename(values.sizer)} holds ${table.records.length} distributions; give a file with one (e.g. cut one row out of a time series)`)
  const result = retrieveRefractiveIndex(
    {
      size: { kind: 'bins', bins: sizerRecordToBins(table, table.records[0], basename(values.sizer)) },
      scattering: values.sca === undefined ? [] : readMeasurements(values.sca, '--sca'),
      absorption: values.abs === undefined ? [] : readMeasurements(values.abs, '--abs'),
      backscatter_fraction: values.bsf === undefined ? [] : readMeasurements(values.bsf, '--bsf')
    },
    { nRange: readRange(values['n-range'], '--n-range', [1.3, 1.8]), kRange: readRange(values['k-range'], '--k-range', [0, 1]) }
  )
  if (values.json) printJson(result)
  else printClosure(result)
  return 0
}

function printClosure(r: ClosureResult): void {
  const out = process.stdout
  const pm = (v: number, sd: number | null) => `${formatNumber(Number(v.toPrecision(4)))} ± ${sd === null ? 'unconstrained' : formatNumber(Number(sd.toPrecision(2)))}`
  out.write(`effective index: n = ${pm(r.best.n, r.best.sd_n)}, k = ${pm(r.best.k, r.best.sd_k)}  (χ² = ${formatNumber(r.best.chi2)}, ${r.dof} degrees of freedom)\n`)
  for (const w of r.warnings) out.write(`warning: ${w}\n`)
  if (r.alternatives.length) {
    out.write('\nother minima within Δχ² of the best:\n')
    const rows: (string | number)[][] = [['n', 'k', 'χ²']]
    for (const a of r.alternatives) rows.push([a.n, a.k, a.chi2])
    printTable(rows)
  }
  out.write('\n')
  const rows: (string | number)[][] = [['quantity', 'wavelength nm', 'measured', 'sd', 'model', '(model − measured)/sd']]
  for (const f of r.best.fits) rows.push([f.quantity, f.wavelength_nm, f.measured, f.sd, f.model, f.residual])
  printTable(rows)
  for (const n of r.notes) out.write(`note: ${n}\n`)
}
