// motebench truncation: nephelometer angular-truncation correction from a population's own phase function.
import { readFile } from 'node:fs/promises'
import { basename } from 'node:path'
import {
  InputError,
  nephelometerTruncation,
  parseComplexIndex,
  parseLength,
  parseSizerText,
  parseStudy,
  sizerRecordToBins,
  type NephelometerGeometry,
  type Sample,
  type Study
} from '../../src-core/index.ts'
import { printJson, printTable, readArgs, readNumber, readPair, UsageError } from './common.ts'
import { readSizerFlags, sizerFlags, sizerHelp } from './sizer-options.ts'

export const truncationHelp = `motebench truncation: nephelometer truncation correction C = σ_true/σ_measured
  --study FILE.mote     the particles: a sample of a study (with --sample NAME), at its composition
  --sample NAME
  --sizer FILE          or a sizer export with one distribution (dry homogeneous spheres of index --m)
  --m N+Ki              refractive index of the sizer's particles, e.g. 1.53+0.01i
${sizerHelp('sizer file: ')}
  --wavelength L        nephelometer channel, e.g. 550nm (a bare number is in nm)
  --angles A:B          angles the instrument sees, degrees (default 7:170)
  --response LIST       non-ideal angular sensitivity relative to sin θ, ANGLE:WEIGHT pairs covering the
                        angles, linearly interpolated, e.g. 7:0.8,20:1,170:0.9 (default: ideal, sin θ)
  --rh P                humidity in the instrument, percent (default: the sample's; 0 for --sizer)
  --json                JSON output
Reports C for total scatter (0–180° against A–B) and for hemispheric backscatter (90–180° against 90–B),
from the population's phase function by Mie theory.`

export async function runTruncation(argv: string[]): Promise<number> {
  const { values } = readArgs('truncation', argv, {
    study: { type: 'string' },
    sample: { type: 'string' },
    sizer: { type: 'string' },
    m: { type: 'string' },
    wavelength: { type: 'string' },
    angles: { type: 'string' },
    response: { type: 'string' },
    rh: { type: 'string' },
    ...sizerFlags,
    json: { type: 'boolean', default: false }
  })
  if (values.wavelength === undefined) throw new UsageError('truncation: --wavelength is required, for example --wavelength 550nm')
  const wavelengthNm = parseLength(values.wavelength, '--wavelength', 'nm') * 1000
  const angles = readPair(values.angles ?? '7:170', { command: 'truncation', flag: '--angles', example: '7:170' })
  const geometry: NephelometerGeometry = { lowDeg: angles[0], highDeg: angles[1] }
  if (values.response !== undefined) {
    const pairs = values.response.split(',').map((p) => {
      const [a, w, extra] = p.split(':')
      if (w === undefined || extra !== undefined) throw new UsageError(`truncation: --response item "${p}" is not ANGLE:WEIGHT`)
      return [readNumber(a, '--response'), readNumber(w, '--response')]
    })
    geometry.response = { angles_deg: pairs.map((p) => p[0]), weight: pairs.map((p) => p[1]) }
  }
  let sample: Sample
  let study: Pick<Study, 'user_materials'> = {}
  if (values.study !== undefined) {
    if (values.sizer !== undefined || values.m !== undefined) throw new UsageError('truncation: give either --study with --sample, or --sizer with --m')
    if (values.sample === undefined) throw new UsageError('truncation: --study needs --sample NAME')
    const parsed = parseStudy(await readFile(values.study, 'utf8'), basename(values.study))
    if (!parsed.ok) throw new InputError(`${values.study}: ${parsed.problems[0].path}`, parsed.problems[0].message, parsed.problems[0].fix)
    const found = parsed.study.samples.find((s) => s.name === values.sample)
    if (!found) throw new UsageError(`truncation: ${values.study} has no sample "${values.sample}"; it has ${parsed.study.samples.map((s) => `"${s.name}"`).join(', ')}`)
    sample = found
    study = parsed.study
  } else {
    if (values.sizer === undefined || values.m === undefined) throw new UsageError('truncation: give --study FILE.mote --sample NAME, or --sizer FILE --m N+Ki')
    const m = parseComplexIndex(values.m, '--m')
    const table = parseSizerText(await readFile(values.sizer, 'utf8'), { ...readSizerFlags('truncation', values), fileName: basename(values.sizer), onBadRow: 'stop' })
    if (table.records.length !== 1) throw new UsageError(`truncation: ${basename(values.sizer)} holds ${table.records.length} distributions; give a file with one`)
    study = { user_materials: [{ id: 'sizer-particles', name: 'particles of the sizer file', index: { kind: 'constant', n: m.n, k: m.k }, density_g_cm3: 1, kappa: 0 }] }
    sample = {
      name: basename(values.sizer),
      size: { kind: 'bins', bins: sizerRecordToBins(table, table.records[0], basename(values.sizer)) },
      composition: { components: [{ material: 'sizer-particles', volume_fraction: 1 }], mixing: 'volume-average' },
      rh_percent: 0,
      rh_history: 'rising',
      layer: { kind: 'depth', depth_m: 1 }
    }
  }
  const rh = values.rh === undefined ? undefined : readNumber(values.rh, '--rh')
  const r = nephelometerTruncation(sample, study, geometry, { wavelengthNm, rhPercent: rh })
  if (values.json) printJson({ sample: sample.name, ...r })
  else {
    process.stdout.write(`${sample.name}: nephelometer ${r.low_deg}°–${r.high_deg}° (${r.ideal_response ? 'ideal sin θ response' : 'given response'}) at ${r.wavelength_nm} nm, RH ${r.rh_percent} %\n`)
    printTable([
      ['', 'C = true/measured', 'measured fraction'],
      ['total scatter', r.total, r.measured_fraction_total],
      ['backscatter', r.backscatter, r.measured_fraction_backscatter]
    ])
    process.stdout.write(`σsca true ${r.sca_true_mm.toPrecision(5)} Mm⁻¹, as measured ${r.sca_measured_mm.toPrecision(5)} Mm⁻¹\n`)
  }
  return 0
}
