// motebench rebin: optical particle counter bin edges (PSL calibration) mapped to true diameters for another index.
import { getMaterial, parseComplexIndex, parseLength, rebinOpcEdges, refractiveIndexAt, type RebinResult } from '../../src-core/index.ts'
import { printJson, printTable, readArgs, readNumber, readPair, UsageError } from './common.ts'

export const rebinHelp = `motebench rebin: optical particle counter bins from calibration diameters to true diameters
  --edges LIST          the counter's bin edges as calibrated, ascending, comma-separated; a bare number is
                        in µm, e.g. 0.3,0.5,0.7,1,2,3 or 300nm,500nm
  --m N+Ki              refractive index of the sampled particles at the laser wavelength, e.g. 1.75+0.3i
  --material ID         or a catalogue component (its index at the laser wavelength), e.g. mineral-dust
  --wavelength L        the counter's laser wavelength, e.g. 633nm (a bare number is in nm)
  --angles A:B          collection angles from the beam direction, degrees, e.g. 35:120
  --calibration-m N+Ki  index of the calibration spheres (default 1.59+0i, polystyrene latex)
  --search-factor F     true diameters are searched from the first edge / F to the last edge × F (default 4)
  --json                JSON output
Each edge maps to the diameter whose collected scattering (∫ S11 sin θ dθ over the angles, Mie theory) for the
sample's index equals that of a calibration sphere at the edge. Where the response is not monotonic in diameter
every candidate is listed and the bin flagged.`

export function runRebin(argv: string[]): number {
  const { values } = readArgs('rebin', argv, {
    edges: { type: 'string' },
    m: { type: 'string' },
    material: { type: 'string' },
    wavelength: { type: 'string' },
    angles: { type: 'string' },
    'calibration-m': { type: 'string' },
    'search-factor': { type: 'string' },
    json: { type: 'boolean', default: false }
  })
  if (values.edges === undefined) throw new UsageError('rebin: --edges is required, for example --edges 0.3,0.5,0.7,1,2')
  if (values.wavelength === undefined) throw new UsageError('rebin: --wavelength is required, for example --wavelength 633nm')
  if (values.angles === undefined) throw new UsageError('rebin: --angles is required, for example --angles 35:120')
  if ((values.m === undefined) === (values.material === undefined)) throw new UsageError('rebin: give the sample index by --m N+Ki or --material ID (one of them)')
  const wavelengthUm = parseLength(values.wavelength, '--wavelength', 'nm')
  const edges = values.edges.split(',').map((e) => parseLength(e, '--edges', 'um'))
  const angles = readPair(values.angles, { command: 'rebin', flag: '--angles', example: '35:120' })
  const index = values.m !== undefined ? parseComplexIndex(values.m, '--m') : refractiveIndexAt(getMaterial(values.material!), wavelengthUm)
  const result = rebinOpcEdges(
    edges,
    index,
    {
      wavelengthNm: wavelengthUm * 1000,
      lowDeg: angles[0],
      highDeg: angles[1],
      calibrationIndex: values['calibration-m'] === undefined ? undefined : parseComplexIndex(values['calibration-m'], '--calibration-m')
    },
    { searchFactor: values['search-factor'] === undefined ? undefined : readNumber(values['search-factor'], '--search-factor') }
  )
  if (values.json) printJson(result)
  else printRebin(result)
  return 0
}

function printRebin(r: RebinResult): void {
  const out = process.stdout
  out.write(`counter at ${r.wavelength_nm} nm, collecting ${r.low_deg}°–${r.high_deg}°; calibration ${r.calibration_index.n}+${r.calibration_index.k}i → sample ${r.sample_index.n}+${r.sample_index.k}i\n`)
  const rows: (string | number)[][] = [['edge µm (calibration)', 'true µm', 'candidates µm']]
  for (const e of r.edges) rows.push([e.calibration_um, Number(e.true_um.toPrecision(5)), e.ambiguous ? e.candidates_um.map((c) => c.toPrecision(4)).join(' ') + (e.calibration_candidates_um.length > 1 ? ` (calibration also at ${e.calibration_candidates_um.map((c) => c.toPrecision(4)).join(' ')})` : '') : ''])
  printTable(rows)
  const flagged = r.bins.filter((b) => b.flagged)
  for (const b of flagged) out.write(`flagged bin ${b.calibration_lo_um}–${b.calibration_hi_um} µm: ${b.reasons.join('; ')}\n`)
  for (const n of r.notes) out.write(`note: ${n}\n`)
}
