// The uncertainty view's editor: a sample's and the site's uncertain inputs (kept in the study's "uncertainty"
// settings, each with how it is applied and its distribution) and the run's settings.
import { Fragment } from 'preact'
import {
  getMaterial,
  formatJsonPath,
  SITE_QUANTITIES,
  UNCERTAIN_QUANTITIES,
  type Sample,
  type Study,
  type UncertainDistribution,
  type UncertainInput,
  type UncertainQuantity,
  type UncertaintySampleSettings,
  type UncertaintySettings
} from '../../src-core/index.ts'
import type { ToolProblem } from '../compute/toolMessages.ts'
import { Field, problemAt, readNumber, readOptional } from '../edit/Field.tsx'
import { num } from '../format.ts'
import { edit } from '../state/actions.ts'
import { useApp } from '../state/store.ts'

const QUANTITY: Record<UncertainQuantity, string> = {
  n: 'n, real refractive index of a component',
  k: 'k, imaginary refractive index of a component',
  median: 'median diameter of a mode (µm)',
  gsd: 'σg, geometric standard deviation of a mode',
  amount: 'amount of a mode (as the mode gives it)',
  density: 'dry density (g cm⁻³)',
  kappa: 'hygroscopicity κ',
  rh: 'relative humidity (%)',
  layer: 'layer: depth, scale height or AOD',
  surface_albedo: 'surface albedo',
  cloud_fraction: 'cloud fraction',
  transmittance: 'transmittance above the layer',
  surface_temperature: 'surface temperature (K)',
  surface_emissivity: 'surface infrared emissivity',
  layer_height: "height of the layer's middle (km)",
  water_column: 'water-vapour column (cm)',
  spread: 'measured bins within their spread'
}

/** The spread input a sample made from a stretch of the station record is offered: z ~ N(0, 1) spreads, every bin together. */
const SPREAD_INPUT: UncertainInput = { quantity: 'spread', apply: 'add', distribution: { kind: 'normal', mean: 0, sd: 1 }, spread_scale: 'standard-error' }
const hasSpread = (sample: Sample): boolean => sample.size.kind === 'bins' && !!sample.size.bins.spread

const APPLY: Record<UncertainInput['apply'], string> = { factor: '× factor', add: '+ offset', set: '= value' }

const DIST: Record<UncertainDistribution['kind'], { label: string; a: string; b: string }> = {
  normal: { label: 'normal', a: 'mean', b: 'sd' },
  lognormal: { label: 'lognormal', a: 'median', b: 'gsd' },
  uniform: { label: 'uniform', a: 'lo', b: 'hi' }
}

const SAMPLE_QUANTITIES = UNCERTAIN_QUANTITIES.filter((q) => !SITE_QUANTITIES.includes(q))

type ListName = 'sample' | 'site'

/** A component's name as the editor shows it, not its id ("black-carbon" → "Black carbon"). */
function displayName(id: string, own: Study['user_materials']): string {
  const u = own?.find((o) => o.id === id)
  if (u) return `${u.name || id} (own)`
  try {
    return getMaterial(id).name
  } catch {
    return id
  }
}

export function settingsOf(study: Study): UncertaintySettings {
  return (study.uncertainty ?? {}) as UncertaintySettings
}

/** The document path of an input of a list (as the schema's problems name it). */
export function inputPath(list: ListName, sampleName: string, j: number): string {
  return formatJsonPath(list === 'site' ? ['uncertainty', 'site', 'inputs', j] : ['uncertainty', 'samples', sampleName, 'inputs', j])
}

/** Changes the study's uncertainty settings; empty lists and an empty block are removed. */
function editSettings(change: (u: UncertaintySettings) => void, key?: string): void {
  edit((st) => {
    const u = (st.uncertainty ?? {}) as UncertaintySettings
    change(u)
    if (u.samples) for (const [k, v] of Object.entries(u.samples)) if (!v.inputs.length) delete u.samples[k]
    if (u.samples && !Object.keys(u.samples).length) delete u.samples
    if (u.site && !u.site.inputs.length) delete u.site
    if (Object.keys(u).length) st.uncertainty = u as Record<string, unknown>
    else delete st.uncertainty
  }, key && `uncertainty:${key}`)
}

function editList(list: ListName, sampleName: string, change: (inputs: UncertainInput[]) => void, key?: string): void {
  editSettings((u) => {
    let l: UncertaintySampleSettings
    if (list === 'site') l = u.site ??= { inputs: [] }
    else {
      u.samples ??= {}
      l = u.samples[sampleName] ??= { inputs: [] }
    }
    change(l.inputs)
  }, key && `${list}:${sampleName}:${key}`)
}

/** The components of every composition of a sample, and its modes. */
function partsOf(sample: Sample): { components: string[]; modes: { value: number; label: string }[] } {
  const comps = [sample.composition, ...(sample.size.kind === 'modes' ? sample.size.modes.map((m) => m.composition) : [])]
  const components = [...new Set(comps.flatMap((c) => c?.components.map((x) => x.material) ?? []))]
  const modes = sample.size.kind === 'modes' ? sample.size.modes.map((m, i) => ({ value: i, label: `mode ${i + 1}${m.name ? ` (${m.name})` : ''}` })) : []
  return { components, modes }
}

/** A new input's distribution for how it is applied: no spread yet to speak of, ready to be widened. */
function defaultDistribution(apply: UncertainInput['apply'], kind: UncertainDistribution['kind'], centre = 1): UncertainDistribution {
  const c = apply === 'factor' ? 1 : apply === 'add' ? 0 : centre
  if (kind === 'normal') return { kind, mean: c, sd: apply === 'factor' ? 0.1 : Math.abs(c) * 0.1 || 1 }
  if (kind === 'lognormal') return { kind, median: c > 0 ? c : 1, gsd: 1.2 }
  const w = apply === 'factor' ? 0.2 : Math.abs(c) * 0.2 || 1
  return { kind, lo: c - w, hi: c + w }
}

function distributionCentre(d: UncertainDistribution): number {
  return d.kind === 'normal' ? d.mean : d.kind === 'lognormal' ? d.median : (d.lo + d.hi) / 2
}

function newInput(list: ListName, sample: Sample): UncertainInput {
  if (list === 'site') return { quantity: 'surface_albedo', apply: 'add', distribution: { kind: 'normal', mean: 0, sd: 0.03 }, bounds: { lo: -0.1, hi: 0.1, method: 'resample' } }
  const { components } = partsOf(sample)
  const absorbing = ['black-carbon', 'brown-carbon', 'mineral-dust'].find((c) => components.includes(c)) ?? components[0]
  return { quantity: 'k', material: absorbing, apply: 'factor', distribution: { kind: 'lognormal', median: 1, gsd: 1.3 } }
}

function InputRow(p: { list: ListName; sample: Sample; j: number; input: UncertainInput; problem?: ToolProblem }) {
  const s = useApp()
  const x = p.input
  const base = inputPath(p.list, p.sample.name, p.j)
  const { components, modes } = partsOf(p.sample)
  const change = (f: (i: UncertainInput) => void, key?: string) => editList(p.list, p.sample.name, (inputs) => f(inputs[p.j]), key && `${p.j}.${key}`)
  const quantities = p.list === 'site' ? SITE_QUANTITIES : SAMPLE_QUANTITIES.filter((q) => q !== 'spread' || hasSpread(p.sample) || x.quantity === 'spread')
  const d = x.distribution
  const names = DIST[d.kind]
  const rowProblems = [base, `${base}.quantity`, `${base}.material`, `${base}.mode`, `${base}.apply`, `${base}.distribution`, `${base}.bounds`]
    .map((path) => ({ path, text: problemAt(path) }))
    .filter((m) => m.text)
  void s
  return (
    <li class={`u-input${p.problem ? ' is-bad' : ''}`} data-input={`${p.list}-${p.j}`}>
      <div class="u-input-row">
        <label class="field">
          <span>Quantity</span>
          <select
            value={x.quantity}
            data-path={`${base}.quantity`}
            onChange={(e) => {
              const q = (e.target as HTMLSelectElement).value as UncertainQuantity
              change((i) => {
                i.quantity = q
                delete i.name
                if (q === 'n' || q === 'k') i.material = i.material && components.includes(i.material) ? i.material : components[0]
                else delete i.material
                if (q !== 'median' && q !== 'gsd' && q !== 'amount') delete i.mode
                if (q === 'spread') {
                  Object.assign(i, structuredClone(SPREAD_INPUT))
                  delete i.bounds
                } else delete i.spread_scale
              })
            }}
          >
            {quantities.map((q) => (
              <option key={q} value={q}>
                {QUANTITY[q]}
              </option>
            ))}
          </select>
        </label>
        {(x.quantity === 'n' || x.quantity === 'k') && (
          <label class="field">
            <span>Component</span>
            <select value={x.material ?? ''} data-path={`${base}.material`} onChange={(e) => change((i) => (i.material = (e.target as HTMLSelectElement).value))}>
              {components.map((c) => (
                <option key={c} value={c}>
                  {displayName(c, s.study.user_materials)}
                </option>
              ))}
              {x.material && !components.includes(x.material) && <option value={x.material}>{x.material} (not in this sample)</option>}
            </select>
          </label>
        )}
        {(x.quantity === 'median' || x.quantity === 'gsd' || x.quantity === 'amount') && modes.length > 0 && (
          <label class="field">
            <span>Mode</span>
            <select
              value={x.mode === undefined ? 'every' : String(typeof x.mode === 'string' ? modes.find((m) => p.sample.size.kind === 'modes' && p.sample.size.modes[m.value].name === x.mode)?.value ?? x.mode : x.mode)}
              data-path={`${base}.mode`}
              onChange={(e) => {
                const v = (e.target as HTMLSelectElement).value
                change((i) => (v === 'every' ? delete i.mode : (i.mode = Number(v))))
              }}
            >
              <option value="every">every mode</option>
              {modes.map((m) => (
                <option key={m.value} value={m.value}>
                  {m.label}
                </option>
              ))}
            </select>
          </label>
        )}
        {x.quantity === 'spread' && (
          <label class="field" title="Standard error: the uncertainty of the stretch's mean (spread/√rows; consecutive rows are correlated, so a lower bound). Standard deviation: the stretch's variability, row to row.">
            <span>Each bin within</span>
            <select value={x.spread_scale ?? 'standard-error'} data-path={`${base}.spread_scale`} data-testid="spread-scale" onChange={(e) => change((i) => (i.spread_scale = (e.target as HTMLSelectElement).value as 'standard-error' | 'standard-deviation'))}>
              <option value="standard-error">standard error of the mean</option>
              <option value="standard-deviation">rows' standard deviation</option>
            </select>
          </label>
        )}
        <label class="field">
          <span>Applied as</span>
          <select
            value={x.apply}
            data-path={`${base}.apply`}
            onChange={(e) => {
              const a = (e.target as HTMLSelectElement).value as UncertainInput['apply']
              change((i) => {
                i.apply = a
                i.distribution = defaultDistribution(a, a === 'factor' ? 'lognormal' : a === 'add' ? 'normal' : i.distribution.kind, distributionCentre(i.distribution))
                delete i.bounds
              })
            }}
          >
            {(Object.keys(APPLY) as UncertainInput['apply'][]).map((a) => (
              <option key={a} value={a}>
                {APPLY[a]}
              </option>
            ))}
          </select>
        </label>
        <label class="field">
          <span>Distribution</span>
          <select
            value={d.kind}
            data-path={`${base}.distribution.kind`}
            onChange={(e) => {
              const k = (e.target as HTMLSelectElement).value as UncertainDistribution['kind']
              change((i) => (i.distribution = defaultDistribution(i.apply, k, distributionCentre(i.distribution))))
            }}
          >
            {(Object.keys(DIST) as UncertainDistribution['kind'][]).map((k) => (
              <option key={k} value={k}>
                {DIST[k].label}
              </option>
            ))}
          </select>
        </label>
        <Field
          path={`${base}.distribution.${names.a}`}
          label={names.a}
          value={(d as unknown as Record<string, number>)[names.a]}
          read={readNumber(names.a)}
          write={(v) => num(v, 6)}
          width="4.5em"
          commit={(v) => change((i) => ((i.distribution as unknown as Record<string, number>)[names.a] = v), names.a)}
        />
        <Field
          path={`${base}.distribution.${names.b}`}
          label={names.b}
          value={(d as unknown as Record<string, number>)[names.b]}
          read={readNumber(names.b)}
          write={(v) => num(v, 6)}
          width="4.5em"
          commit={(v) => change((i) => ((i.distribution as unknown as Record<string, number>)[names.b] = v), names.b)}
        />
      </div>
      <div class="u-input-row bounds-row">
        <label class="field inline">
          <span>Bounds on the drawn value</span>
          <select
            value={x.bounds?.method ?? 'none'}
            data-path={`${base}.bounds.method`}
            onChange={(e) => {
              const v = (e.target as HTMLSelectElement).value
              change((i) => {
                if (v === 'none') delete i.bounds
                else i.bounds = { ...(i.bounds ?? {}), method: v as 'resample' | 'clamp' }
              })
            }}
          >
            <option value="none">none</option>
            <option value="resample">truncate (draw again)</option>
            <option value="clamp">clamp</option>
          </select>
        </label>
        {x.bounds && (
          <Fragment>
            <Field
              path={`${base}.bounds.lo`}
              label="lower"
              value={x.bounds.lo}
              read={readOptional('lower bound')}
              write={(v) => (v === undefined ? '' : num(v, 6))}
              hint="(blank: none)"
              width="4.5em"
              commit={(v) => change((i) => (v === undefined ? delete i.bounds!.lo : (i.bounds!.lo = v)), 'lo')}
            />
            <Field
              path={`${base}.bounds.hi`}
              label="upper"
              value={x.bounds.hi}
              read={readOptional('upper bound')}
              write={(v) => (v === undefined ? '' : num(v, 6))}
              hint="(blank: none)"
              width="4.5em"
              commit={(v) => change((i) => (v === undefined ? delete i.bounds!.hi : (i.bounds!.hi = v)), 'hi')}
            />
          </Fragment>
        )}
        <button type="button" class="small u-remove" aria-label={`Remove uncertain input ${p.j + 1}`} title="Remove this input" onClick={() => editList(p.list, p.sample.name, (inputs) => void inputs.splice(p.j, 1))}>
          Remove
        </button>
      </div>
      {rowProblems.map((m) => (
        <span class="field-error block" role="alert" data-error-for={m.path} key={m.path}>
          {m.text}
        </span>
      ))}
      {p.problem && (
        <span class="field-error block" role="alert" data-error-for={base} data-testid="input-problem">
          {p.problem.message}. {p.problem.fix}
        </span>
      )}
    </li>
  )
}

export function InputList(p: { list: ListName; sample: Sample; inputs: UncertainInput[]; problem?: ToolProblem }) {
  return (
    <fieldset class="u-list" data-list={p.list}>
      <legend>{p.list === 'site' ? 'Uncertain site inputs (used with every sample)' : `Uncertain inputs of “${p.sample.name}”`}</legend>
      {p.inputs.length ? (
        <ol class="u-inputs">
          {p.inputs.map((x, j) => (
            <InputRow key={j} list={p.list} sample={p.sample} j={j} input={x} problem={p.problem?.list === p.list && p.problem.row === j ? p.problem : undefined} />
          ))}
        </ol>
      ) : (
        <p class="help">{p.list === 'site' ? 'None: the site is taken as given.' : 'None yet: every input is taken as given.'}</p>
      )}
      <button type="button" class="small" data-testid={`add-${p.list}-input`} onClick={() => editList(p.list, p.sample.name, (inputs) => void inputs.push(newInput(p.list, p.sample)))}>
        Add {p.list === 'site' ? 'a site input' : 'an input'}
      </button>
      {p.list === 'sample' && hasSpread(p.sample) && !p.inputs.some((x) => x.quantity === 'spread') && (
        <button type="button" class="small" data-testid="add-spread-input" title="The sample's bins are the mean of a stretch of the station record, with each bin's spread kept: draw them within it" onClick={() => editList('sample', p.sample.name, (inputs) => void inputs.push(structuredClone(SPREAD_INPUT)))}>
          Add the measured bins' spread
        </button>
      )}
    </fieldset>
  )
}

export function RunSettings(p: { u: UncertaintySettings }) {
  const u = p.u
  const set = <K extends 'draws' | 'seed' | 'precision' | 'min_draws'>(k: K, v: number | undefined) => editSettings((x) => (v === undefined ? delete x[k] : (x[k] = v)), k)
  const whole = (what: string) => readOptional(what)
  return (
    <div class="row wrap u-settings">
      <Field path="uncertainty.draws" label="Draws (most)" value={u.draws} read={whole('draws')} write={(v) => (v === undefined ? '' : String(v))} hint="blank: 1000" width="5.5em" commit={(v) => set('draws', v)} />
      <Field path="uncertainty.seed" label="Seed" value={u.seed} read={whole('seed')} write={(v) => (v === undefined ? '' : String(v))} hint="blank: 1" width="4em" commit={(v) => set('seed', v)} />
      <label class="field">
        <span>Sampling</span>
        <select
          value={u.sampling ?? 'random'}
          data-path="uncertainty.sampling"
          onChange={(e) => {
            const v = (e.target as HTMLSelectElement).value as 'random' | 'latin-hypercube'
            editSettings((x) => (v === 'random' ? delete x.sampling : (x.sampling = v)))
          }}
        >
          <option value="random">simple random</option>
          <option value="latin-hypercube">Latin hypercube (all draws, no early stop)</option>
        </select>
      </label>
      <Field
        path="uncertainty.precision"
        label="Stop at standard error of P(warm)"
        value={u.precision}
        read={readOptional('precision')}
        write={(v) => (v === undefined ? '' : num(v, 4))}
        hint="blank: 0.01; 0: never early"
        width="4em"
        commit={(v) => set('precision', v)}
      />
      <Field path="uncertainty.min_draws" label="Draws before stopping" value={u.min_draws} read={whole('draws before stopping')} write={(v) => (v === undefined ? '' : String(v))} hint="blank: 200" width="4.5em" commit={(v) => set('min_draws', v)} />
    </div>
  )
}
