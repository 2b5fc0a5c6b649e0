// motebench sphere: one homogeneous (or, with --core-*, coated) sphere.
import {
  angularFromCoefficients,
  coatedSphereEfficiencies,
  CoatedWorkspace,
  newAngularScattering,
  parseComplexIndex,
  parseLength,
  sizeParameter,
  sphereEfficiencies
} from '../../src-core/index.ts'
import { printJson, printTable, readAngles, readArgs, readNumber, UsageError } from './common.ts'

export const sphereHelp = `motebench sphere: efficiencies of one sphere
  --x X                 size parameter x = π D / λ (or give --diameter and --wavelength)
  --diameter D          diameter with a unit, e.g. 0.5um or 500nm
  --wavelength L        wavelength with a unit, e.g. 550nm
  --medium N            real index of the medium (default 1)
  --m N+Ki              refractive index (relative to the medium's when --medium is given), e.g. 1.5+1i (k ≥ 0 absorbs)
  --core-x X            makes the sphere coated: core size parameter (then --x/--diameter and --m are the
                        outer sphere and the shell); or --core-diameter D with --diameter and --wavelength
  --core-m N+Ki         core refractive index (with --core-x or --core-diameter)
  --angles A:S:B        scattering angles in degrees (start:step:end or a list) adds S11, S12, S33, S34, phase
  --json                JSON output`

export function runSphere(argv: string[]): number {
  const { values } = readArgs('sphere', argv, {
    x: { type: 'string' },
    diameter: { type: 'string' },
    wavelength: { type: 'string' },
    medium: { type: 'string' },
    m: { type: 'string' },
    angles: { type: 'string' },
    'core-x': { type: 'string' },
    'core-diameter': { type: 'string' },
    'core-m': { type: 'string' },
    json: { type: 'boolean', default: false }
  })
  if (values.m === undefined) throw new UsageError('sphere: --m is required, for example --m 1.5+1i')
  const m = parseComplexIndex(values.m, '--m')
  const medium = readNumber(values.medium, '--medium', 1)
  if (!(medium > 0 && medium <= 10)) throw new UsageError(`--medium: ${medium} is not the real index of a medium; give a value from above 0 to 10, e.g. 1.33 for water`)
  let x: number
  if (values.x !== undefined) {
    if (values.diameter !== undefined || values.wavelength !== undefined) throw new UsageError('sphere: give either --x or --diameter with --wavelength, not both')
    x = readNumber(values.x, '--x')
  } else {
    if (values.diameter === undefined || values.wavelength === undefined) throw new UsageError('sphere: give --x, or --diameter and --wavelength (e.g. --diameter 0.5um --wavelength 550nm)')
    x = sizeParameter(parseLength(values.diameter, '--diameter'), parseLength(values.wavelength, '--wavelength'), medium)
  }
  const coated = values['core-x'] !== undefined || values['core-diameter'] !== undefined
  if (coated !== (values['core-m'] !== undefined)) throw new UsageError('sphere: a coated sphere needs both a core size (--core-x or --core-diameter) and --core-m')
  const ws = new CoatedWorkspace()
  let eff
  let core: Record<string, unknown> = {}
  if (coated) {
    const cm = parseComplexIndex(values['core-m']!, '--core-m')
    let xCore: number
    if (values['core-x'] !== undefined) xCore = readNumber(values['core-x'], '--core-x')
    else {
      if (values.wavelength === undefined) throw new UsageError('sphere: --core-diameter needs --diameter and --wavelength')
      xCore = sizeParameter(parseLength(values['core-diameter']!, '--core-diameter'), parseLength(values.wavelength, '--wavelength'), medium)
    }
    eff = coatedSphereEfficiencies(xCore, cm.n / medium, cm.k / medium, x, m.n / medium, m.k / medium, ws)
    core = { core_x: xCore, core_m: [cm.n, cm.k] }
  } else {
    eff = sphereEfficiencies(x, m.n / medium, m.k / medium, ws)
  }
  const result: Record<string, unknown> = {
    x,
    m: [m.n, m.k],
    ...core,
    qext: eff.qext,
    qsca: eff.qsca,
    qabs: eff.qabs,
    qback: eff.qback,
    qpr: eff.qpr,
    g: eff.g,
    terms: eff.terms
  }
  let ang: ReturnType<typeof newAngularScattering> | undefined
  if (values.angles !== undefined) {
    ang = angularFromCoefficients(x, ws, eff, newAngularScattering(readAngles(values.angles)))
    Object.assign(result, { angles: ang.angles, s11: ang.s11, s12: ang.s12, s33: ang.s33, s34: ang.s34, phase: ang.phase })
  }
  if (values.json) printJson(result)
  else {
    printTable([
      ['x', 'n', 'k', 'Qext', 'Qsca', 'Qabs', 'Qback', 'Qpr', 'g', 'terms'],
      [x, m.n, m.k, eff.qext, eff.qsca, eff.qabs, eff.qback, eff.qpr, eff.g, eff.terms]
    ])
    if (ang) {
      process.stdout.write('\nphase function normalised so that its integral over the sphere is 4π\n')
      const rows: (string | number)[][] = [['angle°', 'S11', 'S12', 'S33', 'S34', 'phase', 'polarisation']]
      for (let i = 0; i < ang.angles.length; i++) rows.push([ang.angles[i], ang.s11[i], ang.s12[i], ang.s33[i], ang.s34[i], ang.phase[i], ang.polarization[i]])
      printTable(rows)
    }
  }
  return 0
}
