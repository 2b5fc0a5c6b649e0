// motebench materials and motebench material NAME: the component catalogue, and one component at one wavelength.
import { indexSourceAt, listMaterials, parseLength, refractiveIndexAt, type Material } from '../../src-core/index.ts'
import { printJson, printTable, readArgs, UsageError } from './common.ts'

export const materialsHelp = `motebench materials: lists the built-in components
  prints id, name, dry density (g cm⁻³), hygroscopicity κ and the wavelength range of the refractive index
  --json                JSON output: an array of {id, name, density, kappa, wavelength_min_nm, wavelength_max_nm}`

export const materialHelp = `motebench material NAME: one component's refractive index and properties at one wavelength
  NAME                  a catalogue id (see "motebench materials"), e.g. ammonium-sulfate, or its name
  --wavelength L        wavelength with a unit, e.g. 550nm, 0.55um or 10um (required); within the component's
                        tabulated range (see "motebench materials"; 0.2 to 40 µm or more for the catalogue)
  --json                JSON output: {n, k, density (g cm⁻³), kappa, source (of the refractive index)}`

/** Wavelength range of a component in nm (null at an open end). */
function rangeNm(m: Material): [number | null, number | null] {
  const [lo, hi] = m.rangeUm
  return [lo > 0 && Number.isFinite(lo) ? Number((lo * 1000).toPrecision(10)) : null, Number.isFinite(hi) ? Number((hi * 1000).toPrecision(10)) : null]
}

export function runMaterials(argv: string[]): number {
  const { values } = readArgs('materials', argv, { json: { type: 'boolean', default: false } })
  const all = listMaterials()
  if (values.json) {
    printJson(
      all.map((m) => {
        const [lo, hi] = rangeNm(m)
        return { id: m.id, name: m.name, density: m.densityGcm3, kappa: m.kappa, wavelength_min_nm: lo, wavelength_max_nm: hi }
      })
    )
    return 0
  }
  const rows: (string | number)[][] = [['id', 'name', 'density g/cm³', 'κ', 'wavelengths nm']]
  for (const m of all) {
    const [lo, hi] = rangeNm(m)
    rows.push([m.id, m.name, m.densityGcm3, m.kappa, lo === null && hi === null ? 'any' : `${lo ?? 0}–${hi ?? '∞'}`])
  }
  printTable(rows)
  return 0
}

/** A catalogue component by id, or by name ignoring case; a UsageError lists the ids otherwise. */
export function findMaterial(name: string): Material {
  const all = listMaterials()
  const lower = name.trim().toLowerCase()
  const m = all.find((c) => c.id === lower) ?? all.find((c) => c.name.toLowerCase() === lower)
  if (!m) throw new UsageError(`material: "${name}" is not in the catalogue; known: ${all.map((c) => c.id).join(', ')}`)
  return m
}

export function runMaterial(argv: string[]): number {
  const { values, positionals } = readArgs('material', argv, { wavelength: { type: 'string' }, json: { type: 'boolean', default: false } }, true)
  if (positionals.length !== 1) throw new UsageError('material: give one component, for example "motebench material water --wavelength 550nm"')
  const m = findMaterial(positionals[0])
  if (values.wavelength === undefined) throw new UsageError('material: --wavelength is required, for example --wavelength 550nm')
  const wl = parseLength(values.wavelength, '--wavelength')
  const { n, k } = refractiveIndexAt(m, wl)
  const source = indexSourceAt(m, wl)
  if (values.json) {
    printJson({ n, k, density: m.densityGcm3, kappa: m.kappa, source })
    return 0
  }
  const out = process.stdout
  out.write(`${m.name} (${m.id}) at ${Number((wl * 1000).toPrecision(10))} nm\n`)
  printTable([
    ['n', 'k', 'density g/cm³', 'κ'],
    [n, k, m.densityGcm3, m.kappa]
  ])
  out.write(`refractive index: ${source}\ndensity: ${m.sources.density}\nκ: ${m.sources.kappa}\n`)
  if (m.phaseChange) out.write(`deliquescence ${m.phaseChange.deliquescenceRH} % RH, efflorescence ${m.phaseChange.efflorescenceRH} % RH${m.sources.phaseChange ? ` (${m.sources.phaseChange})` : ''}\n`)
  if (m.notes) out.write(`note: ${m.notes}\n`)
  return 0
}
