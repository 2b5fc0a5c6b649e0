// What the particles are made of: components from the catalogue (or the study's own), their volume fractions,
// how they mix, and optional density and κ.
import { listMaterials, type Composition, type MixingName, type Sample, type UserMaterialSpec } from '../../src-core/index.ts'
import { num } from '../format.ts'
import { editSample } from '../state/actions.ts'
import { ErrorRow, Field, problemAt, readFraction, readOptional } from './Field.tsx'
import { Fragment } from 'preact'

const MIXING: { id: MixingName; label: string; help: string }[] = [
  { id: 'volume-average', label: 'Internal: volume-average index', help: 'Refractive indices averaged by volume.' },
  { id: 'maxwell-garnett', label: 'Internal: Maxwell Garnett', help: 'Inclusions in a host; the first component is the host.' },
  { id: 'bruggeman', label: 'Internal: Bruggeman', help: 'Symmetric effective medium.' },
  { id: 'core-shell', label: 'Core–shell', help: 'The first component is the core, the others form the shell.' }
]

/** The composition a sample's editor changes: the sample's own (`mode` absent) or that of one of its modes. */
function compositionOf(s: Sample, mode?: number): Composition | undefined {
  if (mode === undefined) return s.composition
  return s.size.kind === 'modes' ? s.size.modes[mode]?.composition : undefined
}

export function CompositionEditor(p: { id: string; index: number; composition: Composition; userMaterials: UserMaterialSpec[]; mode?: number }) {
  const base = p.mode === undefined ? `samples[${p.index}].composition` : `samples[${p.index}].size.modes[${p.mode}].composition`
  /** Names the controls of a mode's editor apart from the sample's. */
  const of = p.mode === undefined ? '' : ` of mode ${p.mode + 1}`
  const c = p.composition
  const materials = [...listMaterials().filter((m) => m.id !== 'water').map((m) => ({ id: m.id, name: m.name })), ...p.userMaterials.map((u) => ({ id: u.id, name: `${u.name} (own)` }))]
  const sumProblem = problemAt(`${base}.components`) ?? problemAt(base)
  const change = (f: (c: Composition) => void, key?: string) =>
    editSample(p.id, (s) => {
      const cc = compositionOf(s, p.mode)
      if (cc) f(cc)
    }, key && `${base}.${key}`)
  const mixing = MIXING.find((m) => m.id === c.mixing)
  /** Swaps component j with its neighbour; the focus follows the moved component's button. */
  const move = (j: number, by: -1 | 1) => {
    const to = j + by
    if (to < 0 || to >= c.components.length) return
    change((cc) => void ([cc.components[j], cc.components[to]] = [cc.components[to], cc.components[j]]))
    const dir = by < 0 ? 'up' : 'down'
    requestAnimationFrame(() => {
      const next = document.querySelector<HTMLButtonElement>(`[data-move="${base}.components[${to}]:${dir}"]`)
      ;(next && !next.disabled ? next : document.querySelector<HTMLButtonElement>(`[data-move="${base}.components[${to}]:${dir === 'up' ? 'down' : 'up'}"]`))?.focus()
    })
  }
  /** What the rule makes of component j: the core and the shell, the host and the inclusions. */
  const role = (j: number) => (c.mixing === 'core-shell' ? (j === 0 ? 'core' : 'shell') : c.mixing === 'maxwell-garnett' && c.components.length > 1 ? (j === 0 ? 'host' : 'inclusion') : null)
  return (
    <div class="composition">
      <table class="grid-table comp-table">
        <caption class="sr-only">Components{of} by volume fraction of the dry particle</caption>
        <thead>
          <tr>
            <th scope="col">Component{c.mixing === 'core-shell' ? ' (first = core)' : c.mixing === 'maxwell-garnett' ? ' (first = host)' : ''}</th>
            <th scope="col" title="Volume fraction of the dry particle: 0–1, or in % (80 % = 0.8); the fractions add up to 1">Volume fraction</th>
            <th scope="col">
              <span class="sr-only">Move or remove</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {c.components.map((k, j) => (
            <Fragment key={j}>
            <tr data-component={k.material}>
              <td>
                <select
                  aria-label={`Component ${j + 1}${of}`}
                  value={k.material}
                  data-path={`${base}.components[${j}].material`}
                  onChange={(e) => {
                    const v = (e.target as HTMLSelectElement).value
                    change((cc) => (cc.components[j].material = v))
                  }}
                >
                  {materials.map((m) => (
                    <option value={m.id} key={m.id}>
                      {m.name}
                    </option>
                  ))}
                </select>
                {role(j) && (
                  <span class="role-tag" data-role={role(j)}>
                    {role(j)}
                  </span>
                )}
              </td>
              <td>
                <Field
                  bare
                  path={`${base}.components[${j}].volume_fraction`}
                  label={`Volume fraction of component ${j + 1}${of}`}
                  value={k.volume_fraction}
                  read={readFraction('volume fraction')}
                  write={(v) => num(v, 4)}
                  width="5em"
                  commit={(v) => change((cc) => (cc.components[j].volume_fraction = v), `f${j}`)}
                />
              </td>
              <td class="comp-actions">
                <button
                  type="button"
                  class="small ghost"
                  aria-label={`Move component ${j + 1}${of} up`}
                  title={c.mixing === 'core-shell' && j === 1 ? 'Move up (makes it the core)' : 'Move up'}
                  disabled={j === 0}
                  onClick={() => move(j, -1)}
                  data-move={`${base}.components[${j}]:up`}
                >
                  ↑
                </button>
                <button
                  type="button"
                  class="small ghost"
                  aria-label={`Move component ${j + 1}${of} down`}
                  title="Move down"
                  disabled={j === c.components.length - 1}
                  onClick={() => move(j, 1)}
                  data-move={`${base}.components[${j}]:down`}
                >
                  ↓
                </button>
                <button
                  type="button"
                  class="small ghost"
                  aria-label={`Remove component ${j + 1}${of}`}
                  disabled={c.components.length <= 1}
                  onClick={() => change((cc) => void cc.components.splice(j, 1))}
                >
                  ✕
                </button>
              </td>
            </tr>
            <ErrorRow span={3} paths={[`${base}.components[${j}].volume_fraction`, `${base}.components[${j}].material`, `${base}.components[${j}]`]} />
            </Fragment>
          ))}
        </tbody>
      </table>
      {sumProblem && (
        <p class="field-error" role="alert" data-error-for={`${base}.components`}>
          {sumProblem}
        </p>
      )}
      <div class="row">
        <button
          type="button"
          class="small"
          onClick={() => change((cc) => void cc.components.push({ material: materials.find((m) => !cc.components.some((x) => x.material === m.id))?.id ?? 'organic-matter', volume_fraction: 0 }))}
        >
          Add component
        </button>
        <button
          type="button"
          class="small ghost"
          title="Scale the fractions so that they add up to 1"
          onClick={() =>
            change((cc) => {
              const sum = cc.components.reduce((a, b) => a + b.volume_fraction, 0)
              if (sum > 0) for (const x of cc.components) x.volume_fraction = Number((x.volume_fraction / sum).toPrecision(6))
            })
          }
        >
          Make fractions add to 1
        </button>
      </div>
      <div class="row wrap">
        <label class="field">
          <span>Mixing{of}</span>
          <select value={c.mixing} onChange={(e) => change((cc) => (cc.mixing = (e.target as HTMLSelectElement).value as MixingName))} data-path={`${base}.mixing`}>
            {MIXING.map((m) => (
              <option value={m.id} key={m.id}>
                {m.label}
              </option>
            ))}
          </select>
          {mixing && <span class="hint block">{mixing.help}</span>}
        </label>
        <Field
          path={`${base}.density_g_cm3`}
          label={`Dry density${of}`}
          value={c.density_g_cm3}
          read={readOptional('density')}
          write={(v) => (v === undefined ? '' : num(v, 4))}
          hint="g cm⁻³ (blank: from components)"
          width="4.5em"
          commit={(v) => change((cc) => (v === undefined ? delete cc.density_g_cm3 : (cc.density_g_cm3 = v)), 'density')}
        />
        <Field
          path={`${base}.kappa`}
          label={`Hygroscopicity κ${of}`}
          value={c.kappa}
          read={readOptional('κ')}
          write={(v) => (v === undefined ? '' : num(v, 4))}
          hint="(blank: from components)"
          width="4.5em"
          commit={(v) => change((cc) => (v === undefined ? delete cc.kappa : (cc.kappa = v)), 'kappa')}
        />
      </div>
    </div>
  )
}
