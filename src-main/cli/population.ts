// motebench population: bulk optics of lognormal modes of one composition, without a study file.
import { computeSampleOptics, parseComplexIndex, parseLength, type Composition, type ModeSpec, type Sample, type UserMaterialSpec } from '../../src-core/index.ts'
import { formatNumber, need, printJson, printTable, readArgs, readNumber, readTolerance, readWavelengthsNm, UsageError } from './common.ts'
import { findMaterial } from './materials.ts'

export const populationHelp = `motebench population: bulk optics of a particle population given as lognormal modes
  --mode N,D,S          a lognormal mode: number concentration (cm⁻³), count median diameter with a unit,
                        geometric standard deviation, e.g. --mode 1000,0.12um,1.8; repeat for more modes
  --material ID         what the particles are made of: a catalogue id (see "motebench materials")
  --m N+Ki              or a constant refractive index, e.g. 1.53+0.01i (then κ defaults to 0 and density to 1 g cm⁻³)
  --kappa K             hygroscopicity κ, 0 to 2 (overrides the material's)
  --density D           dry density in g cm⁻³ (overrides the material's; used for mass)
  --rh RH               relative humidity in percent (default 0: dry)
  --humidity-history H  rising (default: salts stay dry below deliquescence) or falling (they stay wet down to efflorescence)
  --wavelengths LIST    wavelengths, e.g. 450,550,700 (nm) or 0.45,0.55um (default 450,550,700)
  --tolerance T         relative accuracy of the size integration (default 1e-4)
  --infrared            also the thermal-infrared band optics (12 bands, 4–40 µm; JSON key longwave_bands: lo_um,
                        hi_um, ext, sca, abs, ssa, g; longwave_withheld says why when a component has no infrared index)
  --json                JSON output: number_cm3, volume_um3_cm3 (dry), mass_ug_m3 (dry), angstrom_ext, angstrom_sca,
                        angstrom_abs and wavelengths: [{wavelength_nm, ext, sca, abs (Mm⁻¹), ssa, g,
                        backscatter_fraction, upscatter_fraction}], warnings (figures outside their method's range;
                        empty when there is nothing to say)`

/** "1000,0.12um,1.8" as a mode by number. */
function readMode(text: string): ModeSpec {
  const parts = text.split(',').map((p) => p.trim())
  if (parts.length !== 3) throw new UsageError(`--mode: "${text}" needs three values: number (cm⁻³), median diameter with a unit, geometric standard deviation, e.g. 1000,0.12um,1.8`)
  const number = readNumber(parts[0], '--mode number concentration')
  const median = parseLength(parts[1], '--mode median diameter')
  const gsd = readNumber(parts[2], '--mode geometric standard deviation')
  return { by: 'number', number_cm3: number, median_um: median, gsd }
}

const USER_ID = 'typed-index'

export function runPopulation(argv: string[]): number {
  const { values } = readArgs('population', argv, {
    mode: { type: 'string', multiple: true },
    material: { type: 'string' },
    m: { type: 'string' },
    kappa: { type: 'string' },
    density: { type: 'string' },
    rh: { type: 'string' },
    'humidity-history': { type: 'string' },
    wavelengths: { type: 'string' },
    tolerance: { type: 'string' },
    infrared: { type: 'boolean', default: false },
    json: { type: 'boolean', default: false }
  })
  const modes = need(values.mode, 'population', '--mode', '--mode 1000,0.12um,1.8').map(readMode)
  if ((values.material === undefined) === (values.m === undefined)) throw new UsageError('population: give either --material ID or --m N+Ki (for example --material ammonium-sulfate)')
  const kappa = values.kappa === undefined ? undefined : readNumber(values.kappa, '--kappa')
  if (kappa !== undefined && !(kappa >= 0 && kappa <= 2)) throw new UsageError(`--kappa: ${values.kappa} is outside 0 to 2`)
  const density = values.density === undefined ? undefined : readNumber(values.density, '--density')
  if (density !== undefined && !(density > 0 && density <= 25)) throw new UsageError(`--density: ${values.density} g cm⁻³ is not a density; give a value above 0, e.g. 1.77`)
  const rh = readNumber(values.rh, '--rh', 0)
  if (!(rh >= 0 && rh < 100)) throw new UsageError(`--rh: ${values.rh} is not a relative humidity from 0 to below 100 %`)
  const history = values['humidity-history'] ?? 'rising'
  if (history !== 'rising' && history !== 'falling') throw new UsageError(`--humidity-history: "${history}" is not rising or falling`)
  const wavelengths = readWavelengthsNm(values.wavelengths ?? '450,550,700nm')
  const tolerance = readTolerance(values.tolerance, 1e-4)

  const userMaterials: UserMaterialSpec[] = []
  let composition: Composition
  let described: string
  if (values.m !== undefined) {
    const m = parseComplexIndex(values.m, '--m')
    userMaterials.push({ id: USER_ID, name: `m = ${values.m}`, index: { kind: 'constant', n: m.n, k: m.k }, density_g_cm3: density ?? 1, kappa: kappa ?? 0, source: 'typed on the command line' })
    composition = { components: [{ material: USER_ID, volume_fraction: 1 }], mixing: 'volume-average' }
    described = `m = ${m.n}+${m.k}i, κ = ${kappa ?? 0}, density ${density ?? 1} g/cm³${density === undefined ? ' (unit density assumed)' : ''}`
  } else {
    const mat = findMaterial(values.material!)
    composition = {
      components: [{ material: mat.id, volume_fraction: 1 }],
      mixing: 'volume-average',
      ...(density !== undefined ? { density_g_cm3: density } : {}),
      ...(kappa !== undefined ? { kappa } : {})
    }
    described = `${mat.name}, κ = ${kappa ?? mat.kappa}, density ${density ?? mat.densityGcm3} g/cm³`
  }
  const sample: Sample = {
    name: 'population',
    size: { kind: 'modes', modes },
    composition,
    rh_percent: rh,
    rh_history: history,
    layer: { kind: 'depth', depth_m: 1000 }
  }
  const optics = computeSampleOptics(sample, { wavelengths_nm: wavelengths, user_materials: userMaterials }, { tolerance, angularWavelengthsNm: [], longwave: values.infrared })
  const rows = optics.wavelengths.map((w) => ({
    wavelength_nm: w.wavelength_nm,
    ext: w.ext,
    sca: w.sca,
    abs: w.abs,
    ssa: w.ssa,
    g: w.g,
    backscatter_fraction: w.backscatter_fraction,
    upscatter_fraction: w.upscatter_fraction
  }))
  const a = optics.angstrom_fit
  if (values.json) {
    printJson({
      number_cm3: optics.number_cm3,
      volume_um3_cm3: optics.volume_um3_cm3,
      mass_ug_m3: optics.mass_ug_m3,
      angstrom_ext: a.ext,
      angstrom_sca: a.sca,
      angstrom_abs: a.abs,
      wavelengths: rows,
      ...(values.infrared ? { longwave_bands: optics.longwave?.bands ?? [], longwave_withheld: optics.longwave?.withheld ?? null } : {}),
      warnings: optics.warnings
    })
    return 0
  }
  const out = process.stdout
  out.write(`${modes.length} mode${modes.length === 1 ? '' : 's'} of ${described}, at ${rh} % RH\n`)
  out.write(`dry number ${formatNumber(optics.number_cm3)} cm⁻³, dry volume ${formatNumber(optics.volume_um3_cm3)} µm³/cm³, dry mass ${formatNumber(optics.mass_ug_m3)} µg/m³\n\n`)
  printTable([
    ['λ nm', 'ext Mm⁻¹', 'sca Mm⁻¹', 'abs Mm⁻¹', 'ssa', 'g', 'backscatter', 'upscatter'],
    ...rows.map((r) => [r.wavelength_nm, r.ext, r.sca, r.abs, r.ssa, r.g, r.backscatter_fraction, r.upscatter_fraction])
  ])
  if (values.infrared && optics.longwave) {
    if (optics.longwave.withheld) out.write(`\n${optics.longwave.withheld}\n`)
    else {
      out.write('\nthermal infrared, band averages:\n')
      printTable([['band µm', 'ext Mm⁻¹', 'sca Mm⁻¹', 'abs Mm⁻¹', 'ssa', 'g'], ...optics.longwave.bands.map((b) => [`${b.lo_um}–${b.hi_um}`, b.ext, b.sca, b.abs, b.ssa, b.g])])
    }
  }
  const ang = (v: number) => (Number.isFinite(v) ? formatNumber(v) : '—')
  out.write(`\nÅngström exponents (fit over all wavelengths): extinction ${ang(a.ext)}, scattering ${ang(a.sca)}, absorption ${ang(a.abs)}\n`)
  for (const w of optics.warnings) out.write(`warning: ${w}\n`)
  return 0
}
