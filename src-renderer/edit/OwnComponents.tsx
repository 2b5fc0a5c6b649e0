// The study's own components (user materials): id, name, density, κ and the refractive index as a constant, as
// expressions of the wavelength, or as a table (typed, pasted or loaded as CSV). Every value is checked with
// src-core's defineUserMaterial at the study's wavelengths before it enters the document; a value it refuses is
// marked at its field with the reason. The components appear in the composition editors' component lists.
import { useEffect, useRef, useState } from 'preact/hooks'
import {
  defineUserMaterial,
  InputError,
  parseIndexTableCsv,
  STUDY_WAVELENGTH_RANGE_NM,
  type Composition,
  type Study,
  type UserIndex,
  type UserMaterialSpec
} from '../../src-core/index.ts'
import { num } from '../format.ts'
import { edit, setDraft } from '../state/actions.ts'
import { store, useApp } from '../state/store.ts'
import { Field, problemAt, readNumber } from './Field.tsx'

type Kind = UserIndex['kind']

const KINDS: { id: Kind; label: string; help: string }[] = [
  { id: 'constant', label: 'Constant n and k', help: 'The same index at every wavelength.' },
  { id: 'expression', label: 'Expressions of the wavelength', help: 'mathjs expressions of wl_um (µm) or wl_nm (nm), e.g. k = 0.02 * (wl_nm/550)^-3.' },
  { id: 'table', label: 'Table of wavelength, n, k', help: 'Rows of wavelength, n, k (comma, semicolon or tab separated); a header naming nm or µm sets the unit, else µm. Interpolated between rows.' }
]

/** Checks a component as src-core would use it, at the study's wavelengths; throws InputError. */
function check(spec: UserMaterialSpec, index: number): void {
  const study = store().get().study
  const clash = (study.user_materials ?? []).findIndex((u, i) => i !== index && u.id === spec.id)
  if (clash >= 0) throw new InputError('own component id', `"${spec.id}" is already the id of own component ${clash + 1}`, 'Give each own component its own id.')
  defineUserMaterial(
    { id: spec.id, name: spec.name, densityGcm3: spec.density_g_cm3, kappa: spec.kappa, index: spec.index, source: spec.source },
    study.wavelengths_nm.map((w) => w / 1000)
  )
}

function messageOf(e: unknown): string {
  return e instanceof Error ? e.message : String(e)
}

/**
 * A reader that puts the typed value into a copy of component `index` and checks the whole component. A complaint
 * the stored component already has (e.g. a table that no longer covers a new study wavelength) is not blamed on
 * this field: the study's problems show it.
 */
function checked<T>(index: number, read: (t: string) => T, put: (spec: UserMaterialSpec, v: T) => void): (t: string) => T {
  return (t) => {
    const v = read(t)
    const current = store().get().study.user_materials?.[index]
    if (!current) return v
    const next = structuredClone(current)
    put(next, v)
    try {
      check(next, index)
    } catch (e) {
      let before: string | null = null
      try {
        check(current, index)
      } catch (e0) {
        before = messageOf(e0)
      }
      if (before !== messageOf(e)) throw e
    }
    return v
  }
}

const readText = (what: string) => (t: string) => {
  if (t.trim() === '') throw new InputError(what, 'no text was given', `Type the ${what}.`)
  return t.trim()
}

/** Compositions of the study that use a component: where, in words. */
function usesOf(study: Study, id: string): string[] {
  const out: string[] = []
  const uses = (c: Composition | undefined) => !!c && c.components.some((k) => k.material === id)
  for (const s of study.samples) {
    if (uses(s.composition)) out.push(s.name)
    if (s.size.kind === 'modes') s.size.modes.forEach((m, j) => uses(m.composition) && out.push(`${s.name}, ${m.name ?? `mode ${j + 1}`}`))
  }
  return out
}

function renameUses(study: Study, from: string, to: string): void {
  const fix = (c: Composition | undefined) => c?.components.forEach((k) => k.material === from && (k.material = to))
  for (const s of study.samples) {
    fix(s.composition)
    if (s.size.kind === 'modes') for (const m of s.size.modes) fix(m.composition)
  }
}

function changeOwn(index: number, f: (u: UserMaterialSpec, study: Study) => void, key?: string): void {
  edit((study) => {
    const u = study.user_materials?.[index]
    if (u) f(u, study)
  }, key)
}

function freshId(study: Study): string {
  const taken = new Set((study.user_materials ?? []).map((u) => u.id))
  for (let i = 1; ; i++) if (!taken.has(`own-${i}`)) return `own-${i}`
}

function tableText(rows: [number, number, number][]): string {
  return ['wavelength_um,n,k', ...rows.map((r) => r.map((v) => String(v)).join(','))].join('\n')
}

/** The index converted to another kind, keeping what carries over (a constant becomes a flat table, etc.). */
function convert(index: UserIndex, to: Kind): UserIndex {
  const nk: [number, number] =
    index.kind === 'constant' ? [index.n, index.k] : index.kind === 'table' ? [index.rows[0][1], index.rows[0][2]] : Number.isFinite(Number(index.n)) && Number.isFinite(Number(index.k)) ? [Number(index.n), Number(index.k)] : [1.5, 0]
  if (to === 'constant') return { kind: 'constant', n: nk[0], k: nk[1] }
  if (to === 'expression') return { kind: 'expression', n: String(nk[0]), k: String(nk[1]) }
  const [lo, hi] = STUDY_WAVELENGTH_RANGE_NM
  return { kind: 'table', rows: [[lo / 1000, nk[0], nk[1]], [hi / 1000, nk[0], nk[1]]] }
}

/** The index table as CSV text, checked as it is typed, pasted or loaded from a file. */
function TableEditor(p: { index: number; spec: UserMaterialSpec & { index: { kind: 'table' } } }) {
  const path = `user_materials[${p.index}].index.rows`
  const rows = p.spec.index.rows
  const [text, setText] = useState(() => tableText(rows))
  const [bad, setBad] = useState<string | null>(null)
  const file = useRef<HTMLInputElement>(null)
  const label = `Index table of ${p.spec.name || p.spec.id}`

  useEffect(() => {
    try {
      if (JSON.stringify(parseIndexTableCsv(text)) === JSON.stringify(rows)) return
    } catch {
      /* unreadable text: show the document's table */
    }
    setText(tableText(rows))
    setBad(null)
    setDraft(path, null)
  }, [JSON.stringify(rows), path])
  useEffect(() => () => setDraft(path, null), [path])

  const take = (t: string, source?: string) => {
    setText(t)
    try {
      const read = checked(p.index, (x) => parseIndexTableCsv(x, { source: source ?? 'index table' }), (u, v) => (u.index = { kind: 'table', rows: v }))
      const v = read(t)
      setBad(null)
      setDraft(path, null)
      if (JSON.stringify(v) !== JSON.stringify(rows)) changeOwn(p.index, (u) => (u.index = { kind: 'table', rows: v }), path)
    } catch (e) {
      const r = messageOf(e)
      setBad(r)
      setDraft(path, r)
    }
  }
  const message = bad ?? problemAt(path)
  return (
    <div class={`field index-table${message ? ' is-bad' : ''}`}>
      <label for={`own-table-${p.index}`}>{label}</label>
      <textarea
        id={`own-table-${p.index}`}
        rows={6}
        spellcheck={false}
        value={text}
        data-path={path}
        aria-invalid={message ? 'true' : 'false'}
        aria-describedby={message ? `own-table-${p.index}-err` : undefined}
        onInput={(e) => take((e.target as HTMLTextAreaElement).value)}
      />
      <span class="row">
        <button type="button" class="small" onClick={() => file.current?.click()}>
          Load the table from a CSV file…
        </button>
        <span class="hint">{rows.length} rows</span>
      </span>
      <input
        ref={file}
        type="file"
        accept=".csv,.tsv,.txt,text/csv,text/plain"
        class="sr-only"
        tabIndex={-1}
        aria-hidden="true"
        data-testid={`own-table-file-${p.index}`}
        onChange={(e) => {
          const input = e.target as HTMLInputElement
          const f = input.files?.[0]
          if (f) void f.text().then((t) => take(t, f.name))
          input.value = ''
        }}
      />
      {message && (
        <span class="field-error" id={`own-table-${p.index}-err`} role="alert" data-error-for={path}>
          {message}
        </span>
      )}
    </div>
  )
}

function OwnComponent(p: { index: number; spec: UserMaterialSpec; study: Study }) {
  const u = p.spec
  const i = p.index
  const at = `user_materials[${i}]`
  const label = u.name || u.id
  const used = usesOf(p.study, u.id)
  const kind = KINDS.find((k) => k.id === u.index.kind)
  const general = [problemAt(`${at}.index`), problemAt(at)].filter((x): x is string => !!x)
  return (
    <li class="own-component" data-own-component={u.id}>
      <div class="row wrap">
        <Field
          text
          path={`${at}.id`}
          label="Id"
          value={u.id}
          read={checked(i, readText('id'), (s, v) => (s.id = v))}
          write={(v) => v}
          hint="lowercase-hyphenated"
          width="9em"
          commit={(v) =>
            changeOwn(i, (s, study) => {
              renameUses(study, s.id, v)
              s.id = v
            }, `${at}.id`)
          }
        />
        <Field text path={`${at}.name`} label="Name" value={u.name} read={checked(i, readText('name'), (s, v) => (s.name = v))} write={(v) => v} width="12em" commit={(v) => changeOwn(i, (s) => (s.name = v), `${at}.name`)} />
        <Field
          path={`${at}.density_g_cm3`}
          label="Dry density"
          value={u.density_g_cm3}
          read={checked(i, readNumber('density'), (s, v) => (s.density_g_cm3 = v))}
          write={(v) => num(v, 4)}
          hint="g cm⁻³"
          width="4.5em"
          commit={(v) => changeOwn(i, (s) => (s.density_g_cm3 = v), `${at}.density`)}
        />
        <Field
          path={`${at}.kappa`}
          label="Hygroscopicity κ"
          value={u.kappa}
          read={checked(i, readNumber('κ'), (s, v) => (s.kappa = v))}
          write={(v) => num(v, 4)}
          width="4.5em"
          commit={(v) => changeOwn(i, (s) => (s.kappa = v), `${at}.kappa`)}
        />
      </div>
      <div class="row wrap">
        <label class="field">
          <span>Refractive index given as</span>
          <select
            value={u.index.kind}
            data-path={`${at}.index.kind`}
            onChange={(e) => {
              const to = (e.target as HTMLSelectElement).value as Kind
              changeOwn(i, (s) => (s.index = convert(s.index, to)))
            }}
          >
            {KINDS.map((k) => (
              <option value={k.id} key={k.id}>
                {k.label}
              </option>
            ))}
          </select>
          {kind && <span class="hint block">{kind.help}</span>}
        </label>
        {u.index.kind === 'constant' && (
          <>
            <Field
              path={`${at}.index.n`}
              label="n (real part)"
              value={u.index.n}
              read={checked(i, readNumber('n'), (s, v) => s.index.kind === 'constant' && (s.index.n = v))}
              write={(v) => num(v, 5)}
              width="5em"
              commit={(v) => changeOwn(i, (s) => s.index.kind === 'constant' && (s.index.n = v), `${at}.n`)}
            />
            <Field
              path={`${at}.index.k`}
              label="k (imaginary part)"
              value={u.index.k}
              read={checked(i, readNumber('k'), (s, v) => s.index.kind === 'constant' && (s.index.k = v))}
              write={(v) => num(v, 5)}
              width="5em"
              commit={(v) => changeOwn(i, (s) => s.index.kind === 'constant' && (s.index.k = v), `${at}.k`)}
            />
          </>
        )}
        {u.index.kind === 'expression' && (
          <>
            <Field
              text
              path={`${at}.index.n`}
              label="n(wl_um, wl_nm)"
              value={u.index.n}
              read={checked(i, (t) => t.trim(), (s, v) => s.index.kind === 'expression' && (s.index.n = v))}
              write={(v) => v}
              width="14em"
              commit={(v) => changeOwn(i, (s) => s.index.kind === 'expression' && (s.index.n = v), `${at}.n`)}
            />
            <Field
              text
              path={`${at}.index.k`}
              label="k(wl_um, wl_nm)"
              value={u.index.k}
              read={checked(i, (t) => t.trim(), (s, v) => s.index.kind === 'expression' && (s.index.k = v))}
              write={(v) => v}
              width="14em"
              commit={(v) => changeOwn(i, (s) => s.index.kind === 'expression' && (s.index.k = v), `${at}.k`)}
            />
          </>
        )}
      </div>
      {u.index.kind === 'table' && <TableEditor index={i} spec={u as UserMaterialSpec & { index: { kind: 'table' } }} />}
      {general.map((g) => (
        <p class="field-error" role="alert" data-error-for={`${at}.index`} key={g}>
          {g}
        </p>
      ))}
      <div class="row">
        <button
          type="button"
          class="small ghost"
          disabled={used.length > 0}
          aria-describedby={used.length ? `own-used-${i}` : undefined}
          onClick={() => edit((study) => void study.user_materials?.splice(i, 1))}
        >
          Remove {label}
        </button>
        {used.length > 0 && (
          <span class="hint" id={`own-used-${i}`}>
            In use by {used.join('; ')}: choose another component there to remove it.
          </span>
        )}
      </div>
    </li>
  )
}

/** The study's own components, under a summary that opens them. */
export function OwnComponents() {
  const s = useApp()
  const own = s.study.user_materials ?? []
  const [open, setOpen] = useState(own.length > 0)
  return (
    <details class="own-components" open={open} onToggle={(e) => setOpen((e.target as HTMLDetailsElement).open)} data-testid="own-components">
      <summary>Own components ({own.length})</summary>
      <p class="hint block">Components of this study with your own refractive index, density and κ; they are offered in every component list.</p>
      {own.length > 0 && (
        <ol class="own-list">
          {own.map((u, i) => (
            <OwnComponent index={i} spec={u} study={s.study} key={i} />
          ))}
        </ol>
      )}
      <button
        type="button"
        class="small"
        data-testid="add-own-component"
        onClick={() =>
          edit((study) => {
            const id = freshId(study)
            const list = (study.user_materials ??= [])
            list.push({ id, name: `Own component ${list.length + 1}`, density_g_cm3: 1.5, kappa: 0, index: { kind: 'constant', n: 1.5, k: 0 } })
          })
        }
      >
        Add an own component
      </button>
    </details>
  )
}
