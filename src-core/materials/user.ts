/**
 * User-defined components: a constant index, a table of already-parsed rows, or mathjs expressions of the
 * wavelength. Each is checked at the study's wavelengths when it is defined.
 */
import { mathCompile } from '../mathjsExpressions.ts'
import { InputError, requireInRange } from '../errors.ts'
import { buildTableIndex, refractiveIndexAt, type ExpressionIndex, type IndexModel, type Material } from './material.ts'
import { listMaterials } from './catalogue.ts'

/** How a user gives the refractive index of a component. */
export type UserIndexSpec =
  /** m = n + ik at all wavelengths. */
  | { readonly kind: 'constant'; readonly n: number; readonly k: number }
  /** Rows (wavelength µm, n, k), any order, distinct wavelengths, at least two; interpolated like the catalogue. */
  | { readonly kind: 'table'; readonly rows: ReadonlyArray<readonly [number, number, number]> }
  /**
   * mathjs expressions of `wl_um` (wavelength in µm) and `wl_nm` (in nm), e.g. n = "1.5", k = "0.02 * (wl_nm/550)^-5".
   * Compiled once; each must give a real number.
   */
  | { readonly kind: 'expression'; readonly n: string; readonly k: string }

export interface UserMaterialDefinition {
  /** Lowercase letters, digits and hyphens, e.g. `my-smoke`; must differ from the catalogue ids. */
  readonly id: string
  /** Display name; defaults to the id. */
  readonly name?: string
  /** Dry density, g cm⁻³, > 0. */
  readonly densityGcm3: number
  /** Hygroscopicity κ, 0 to 2; defaults to 0 (no water uptake). */
  readonly kappa?: number
  readonly index: UserIndexSpec
  /** Where the numbers come from, in the user's words; defaults to "user input". */
  readonly source?: string
}

const ID_PATTERN = /^[a-z0-9]+(-[a-z0-9]+)*$/

function compileExpression(label: string, which: 'n' | 'k', text: string): (wavelengthUm: number) => number {
  const where = `${label} ${which} expression`
  if (typeof text !== 'string' || text.trim() === '') {
    throw new InputError(where, `the ${which} expression is empty`, `Write ${which} as an expression of wl_um or wl_nm, e.g. ${which === 'n' ? '"1.5"' : '"0.02 * (wl_nm/550)^-5"'}.`)
  }
  let code: { evaluate: (scope?: object) => unknown }
  try {
    code = mathCompile(text)
  } catch (e) {
    const why = e instanceof Error ? e.message : String(e)
    throw new InputError(where, `"${text}" does not parse (${why})`, 'Check the brackets and operators; variables are wl_um (µm) and wl_nm (nm).')
  }
  const scope = { wl_um: 0, wl_nm: 0 }
  return (wavelengthUm: number): number => {
    scope.wl_um = wavelengthUm
    scope.wl_nm = wavelengthUm * 1000
    let v: unknown
    try {
      v = code.evaluate(scope)
    } catch (e) {
      const why = e instanceof Error ? e.message : String(e)
      throw new InputError(`${where} at ${wavelengthUm} µm`, `"${text}" cannot be evaluated (${why})`, 'Use only numbers, operators, functions and the variables wl_um (µm) and wl_nm (nm).')
    }
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      const shown = typeof v === 'number' ? String(v) : v !== null && typeof v === 'object' ? `a non-real value (${String(v)})` : String(v)
      throw new InputError(`${where} at ${wavelengthUm} µm`, `"${text}" gives ${shown}, not a finite real number`, `Change the expression so that ${which} is a finite real number at every study wavelength.`)
    }
    return v
  }
}

/**
 * Builds a user component and checks it at each of `studyWavelengthsUm` (µm): n > 0 and k >= 0 there, tables
 * covering each wavelength, expressions parsing and giving finite real numbers. Throws InputError naming the
 * component and the failing wavelength (and the expression text, for expressions).
 * Domain: density > 0 g cm⁻³; 0 <= κ <= 2 (Petters & Kreidenweis 2007, Atmos. Chem. Phys. 7:1961, report κ up to ≈ 1.4).
 */
export function defineUserMaterial(def: UserMaterialDefinition, studyWavelengthsUm: readonly number[]): Material {
  if (typeof def.id !== 'string' || !ID_PATTERN.test(def.id)) {
    throw new InputError('user component id', `"${def.id}" is not lowercase letters, digits and single hyphens`, 'Use an id like "my-smoke".')
  }
  if (listMaterials().some((m) => m.id === def.id)) {
    throw new InputError(`user component id`, `"${def.id}" is already a catalogue id`, 'Choose another id for the user component.')
  }
  const name = def.name && def.name.trim() !== '' ? def.name : def.id
  const label = name === def.id ? def.id : `${name} (${def.id})`
  if (!Number.isFinite(def.densityGcm3) || def.densityGcm3 <= 0) {
    throw new InputError(`${label} density`, `${def.densityGcm3} g cm⁻³ is not a positive number`, 'Give the dry density in g cm⁻³, e.g. 1.5.')
  }
  const kappa = def.kappa ?? 0
  requireInRange(`${label} hygroscopicity κ`, kappa, 0, 2)
  const source = def.source && def.source.trim() !== '' ? def.source : 'user input'

  let index: IndexModel
  let rangeUm: readonly [number, number] = [0, Infinity]
  const spec = def.index
  switch (spec?.kind) {
    case 'constant': {
      if (!Number.isFinite(spec.n) || spec.n <= 0) {
        throw new InputError(`${label} n`, `n = ${spec.n} is not a positive number`, 'The real part n of a refractive index must be greater than 0.')
      }
      if (!Number.isFinite(spec.k) || spec.k < 0) {
        throw new InputError(`${label} k`, `k = ${spec.k} is not a number >= 0`, 'The imaginary part k must be 0 (no absorption) or positive.')
      }
      index = { kind: 'constant', n: spec.n, k: spec.k }
      break
    }
    case 'table': {
      const rows = Array.isArray(spec.rows) ? spec.rows.slice().sort((a, b) => (a?.[0] ?? NaN) - (b?.[0] ?? NaN)) : []
      index = buildTableIndex(`${label} table`, rows, rows.map(() => source))
      const w = index.wavelengthsUm
      rangeUm = [w[0], w[w.length - 1]]
      break
    }
    case 'expression': {
      const e: ExpressionIndex = {
        kind: 'expression',
        nExpression: spec.n,
        kExpression: spec.k,
        evaluateN: compileExpression(label, 'n', spec.n),
        evaluateK: compileExpression(label, 'k', spec.k)
      }
      index = e
      break
    }
    default:
      throw new InputError(`${label} index`, `unknown index kind "${(spec as { kind?: unknown } | undefined)?.kind}"`, 'Use kind "constant", "table" or "expression".')
  }

  const material: Material = Object.freeze({
    id: def.id,
    name,
    densityGcm3: def.densityGcm3,
    kappa,
    index,
    rangeUm,
    sources: { index: source, density: source, kappa: def.kappa === undefined ? 'default κ = 0 (no water uptake)' : source }
  })

  if (!Array.isArray(studyWavelengthsUm) || studyWavelengthsUm.length === 0) {
    throw new InputError(`${label} study wavelengths`, 'no study wavelengths were given to check the component at', 'Pass the study wavelengths in µm.')
  }
  for (const wl of studyWavelengthsUm) refractiveIndexAt(material, wl)
  return material
}
