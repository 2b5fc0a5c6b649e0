// The report's account of what decides each sample's results, written out so that a reader can reproduce them:
// lognormal modes as entered, measured bins with their source and values, the sample's main composition and the
// modes' own ones (components, mixing rule, density, κ), and the study's own components with their definition and
// their index at the study's wavelengths. Display only: the effective density, κ and indices shown come from src-core.
import {
  getMaterial,
  refractiveIndexAt,
  resolveComposition,
  studyMaterials,
  type BinsSpec,
  type Composition,
  type Material,
  type MixingName,
  type ModeSpec,
  type ParticleKind,
  type Study,
  type UserMaterialSpec
} from '../../src-core/index.ts'
import { amountOf, BY as MODE_FORMS } from '../edit/ModesTable.tsx'
import { diameter, num } from '../format.ts'

/** A number as the document holds it: up to 8 significant digits, no trailing zeros. */
const held = (x: number): string => num(x, 8)

/** A volume fraction as a percentage, as held. */
const percent = (f: number): string => `${held(f * 100)} %`

/** One of the study's own components as src-core defines it at the study's wavelengths, or why it cannot be used. */
export interface OwnComponentState {
  spec: UserMaterialSpec
  material?: Material
  problem?: string
}

/** Each own component defined on its own, so that one unusable component leaves the others in the report. */
export function ownComponentStates(study: Study): OwnComponentState[] {
  return (study.user_materials ?? []).map((spec) => {
    try {
      const [material] = studyMaterials({ user_materials: [spec], wavelengths_nm: study.wavelengths_nm })
      return { spec, material }
    } catch (e) {
      return { spec, problem: e instanceof Error ? e.message : String(e) }
    }
  })
}

function componentName(id: string, own: readonly OwnComponentState[]): string {
  const u = own.find((o) => o.spec.id === id)
  if (u) return `${u.spec.name || id} (own)`
  try {
    return getMaterial(id).name
  } catch {
    return `${id} (not a known component)`
  }
}

const MIXING_WORDS: Record<MixingName, string> = {
  'volume-average': 'internal mixture, volume-averaged refractive index',
  'maxwell-garnett': 'internal mixture, Maxwell Garnett',
  bruggeman: 'internal mixture, Bruggeman effective medium',
  'core-shell': 'core–shell, the shell components volume-averaged'
}

/** The components of a composition in words, naming the core and shell (or host) where the rule has them. */
function componentList(c: Composition, own: readonly OwnComponentState[]): string {
  const parts = c.components.map((k) => `${componentName(k.material, own)} ${percent(k.volume_fraction)}`)
  if (c.mixing === 'core-shell') return `core: ${parts[0] ?? '—'}; shell: ${parts.slice(1).join(', ') || '—'}`
  if (c.mixing === 'maxwell-garnett' && parts.length > 1) return `host: ${parts[0]}; inclusions: ${parts.slice(1).join(', ')}`
  return parts.join(', ')
}

/** A composition: components by dry volume, the mixing rule, density and κ (entered, or the mean src-core takes). */
export function CompositionText(p: { composition: Composition; own: readonly OwnComponentState[]; where: string }) {
  const c = p.composition
  let kind: ParticleKind | undefined
  try {
    kind = resolveComposition(c, p.own.flatMap((o) => (o.material ? [o.material] : [])), p.where)
  } catch {
    kind = undefined // the study's problems name the fault; the report shows what was entered
  }
  const density = c.density_g_cm3 !== undefined ? `${held(c.density_g_cm3)} g cm⁻³ (entered)` : kind ? `${num(kind.densityGcm3, 4)} g cm⁻³` : null
  const kappa = c.kappa !== undefined ? `${held(c.kappa)} (entered)` : kind ? num(kind.kappa, 4) : null
  const averaged = [c.density_g_cm3 === undefined && 'density', c.kappa === undefined && 'κ'].filter((x): x is string => !!x)
  const properties = `Dry density ${density ?? 'not resolved'}, κ ${kappa ?? 'not resolved'}${averaged.length ? ` (${averaged.join(' and ')}: volume-weighted mean of the components)` : ''}.`
  const salt = kind?.phaseChange
  return (
    <div class="report-composition">
      <div data-part="components">{componentList(c, p.own)}</div>
      <div class="detail">
        Mixing: {MIXING_WORDS[c.mixing] ?? c.mixing}. {properties}
        {salt && ` Salt hysteresis: deliquescence at ${num(salt.deliquescenceRH, 4)} % RH, efflorescence at ${num(salt.efflorescenceRH, 4)} % RH.`}
      </div>
    </div>
  )
}

const modeLabel = (m: ModeSpec, j: number): string => `mode ${j + 1}${m.name ? ` (${m.name})` : ''}`

/** The lognormal modes as entered, and for each whether it is made of the main composition or its own. */
export function ModesList(p: { modes: ModeSpec[] }) {
  return (
    <table class="grid-table report-modes">
      <thead>
        <tr>
          <th scope="col">Mode</th>
          <th scope="col">Amount</th>
          <th scope="col">Median diameter</th>
          <th scope="col">σg</th>
          <th scope="col">Composition</th>
        </tr>
      </thead>
      <tbody>
        {p.modes.map((m, j) => {
          const form = MODE_FORMS[m.by]
          return (
            <tr key={j} data-report-mode={j}>
              <th scope="row">
                {j + 1}. {m.name ?? ''}
              </th>
              <td>
                {form.amount} = {held(amountOf(m))} {form.unit}
              </td>
              <td>
                {form.median} {diameter(m.median_um, 8)}
              </td>
              <td>{held(m.gsd)}</td>
              <td>{m.composition ? 'its own (below)' : 'the main one'}</td>
            </tr>
          )
        })}
      </tbody>
    </table>
  )
}

/** Which parts of the size distribution the main composition is used for, said plainly. */
export function mainCompositionUse(size: { kind: 'modes'; modes: ModeSpec[] } | { kind: 'bins' }): string {
  if (size.kind === 'bins') return 'Used for the measured bins.'
  const modes = size.modes
  const shared = modes.flatMap((m, j) => (m.composition ? [] : [modeLabel(m, j)]))
  const own = modes.flatMap((m, j) => (m.composition ? [modeLabel(m, j)] : []))
  if (!own.length) return modes.length === 1 ? 'Used for the one mode.' : `Used for all ${modes.length} modes.`
  if (!shared.length) return 'Used for no mode: every mode has its own composition (below).'
  return `Used for ${shared.join(', ')}; ${own.join(', ')} ${own.length === 1 ? 'has its' : 'have their'} own composition (below).`
}

/** Measured bins: what they are, where they came from, and their values in a compact list. */
export function BinsSummary(p: { bins: BinsSpec }) {
  const b = p.bins
  const n = b.values.length
  const unit = b.diameter_unit === 'um' ? 'µm' : 'nm'
  const scale = b.diameter_unit === 'nm' ? 1e-3 : 1
  const lo = b.diameters[0] * scale
  const hi = b.diameters[b.diameters.length - 1] * scale
  const given = b.edges ? `${b.diameters.length} bin edges` : `${n} bin midpoints (edges at their geometric means)`
  return (
    <div class="report-bins-block">
      <div data-part="bins-summary">
        {n} measured bins, values as {b.quantity}; diameters given as {given}, {diameter(lo)} to {diameter(hi)}. Source: {b.source ?? 'not recorded'}.
      </div>
      <div class="detail">
        Bins (D in {unit}: {b.quantity}):
      </div>
      <ol class="report-bins">
        {b.values.map((v, i) => (
          <li key={i}>
            <span>{b.edges ? `${held(b.diameters[i])}–${held(b.diameters[i + 1])}` : held(b.diameters[i])}:</span> <span>{held(v)}</span>
          </li>
        ))}
      </ol>
    </div>
  )
}

function indexDefinition(u: UserMaterialSpec): string {
  const x = u.index
  if (x.kind === 'constant') return `constant: n = ${held(x.n)}, k = ${held(x.k)} at every wavelength`
  if (x.kind === 'expression') return `expressions of wl_um, wl_nm: n = ${x.n}; k = ${x.k}`
  const w = x.rows.map((r) => r[0])
  return `table of ${x.rows.length} rows (wavelength, n, k), ${held(Math.min(...w))}–${held(Math.max(...w))} µm, interpolated between rows`
}

const complex = (n: number, k: number): string => `${num(n, 5)} + ${num(k, 4)}i`

/** Components per table of indices at the study's wavelengths, so that each table fits an A4 page's width. */
const INDEX_COLUMNS = 4

/**
 * The study's own components: their definition, density and κ in one table, then (for those whose index changes
 * with wavelength) the index at each of the study's wavelengths. Nothing when the study has none.
 */
export function OwnComponentsReport(p: { study: Study; own: OwnComponentState[] }) {
  if (!p.own.length) return null
  const withSource = p.own.some((o) => o.spec.source)
  const varying = p.own.filter((o) => o.material && o.spec.index.kind !== 'constant')
  const groups: OwnComponentState[][] = []
  for (let i = 0; i < varying.length; i += INDEX_COLUMNS) groups.push(varying.slice(i, i + INDEX_COLUMNS))
  const wl = p.study.wavelengths_nm
  return (
    <section class="report-own" data-testid="report-own-components">
      <h2>Own components of the study</h2>
      <table class="grid-table report-own-table">
        <thead>
          <tr>
            <th scope="col">Id</th>
            <th scope="col">Name</th>
            <th scope="col">Refractive index n + ik</th>
            <th scope="col">Dry density</th>
            <th scope="col">κ</th>
            {withSource && <th scope="col">Source</th>}
          </tr>
        </thead>
        <tbody>
          {p.own.map((o) => (
            <tr key={o.spec.id} data-own-component={o.spec.id}>
              <th scope="row">{o.spec.id}</th>
              <td>{o.spec.name}</td>
              <td data-col="index">
                {indexDefinition(o.spec)}
                {o.problem && <div class="field-error">Not usable as it stands: {o.problem}</div>}
              </td>
              <td class="nowrap">{held(o.spec.density_g_cm3)} g cm⁻³</td>
              <td>{held(o.spec.kappa)}</td>
              {withSource && <td>{o.spec.source ?? ''}</td>}
            </tr>
          ))}
        </tbody>
      </table>
      {groups.map((g, gi) => (
        <table class="grid-table numbers report-own-index" key={gi} data-testid="report-own-index">
          <caption>
            Index n + ik at the study's wavelengths{groups.length > 1 ? ` (${gi + 1} of ${groups.length})` : ''}
          </caption>
          <thead>
            <tr>
              <th scope="col">Wavelength</th>
              {g.map((o) => (
                <th scope="col" key={o.spec.id}>
                  {o.spec.name || o.spec.id}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {wl.map((w) => (
              <tr key={w} data-wavelength={w}>
                <th scope="row">{num(w, 6)} nm</th>
                {g.map((o) => {
                  const m = refractiveIndexAt(o.material!, w / 1000)
                  return (
                    <td key={o.spec.id} data-own-component={o.spec.id}>
                      {complex(m.n, m.k)}
                    </td>
                  )
                })}
              </tr>
            ))}
          </tbody>
        </table>
      ))}
    </section>
  )
}
