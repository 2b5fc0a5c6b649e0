// How sure is the verdict: the selected sample's uncertain inputs (kept in the study's "uncertainty" settings), a
// Monte Carlo run in the tools worker, and what it says: P(warm) with its standard error, the forcing histogram,
// each figure's median and 5–95 % range, and which inputs matter (Spearman rank correlation).
import { Fragment } from 'preact'
import { useMemo } from 'preact/hooks'
import {
  getMaterial,
  formatJsonPath,
  SITE_QUANTITIES,
  UNCERTAIN_QUANTITIES,
  UNCERTAINTY_VERDICT_FIGURE,
  UNCERTAINTY_WAVELENGTH_NM,
  type Sample,
  type Study,
  type UncertainDistribution,
  type UncertainInput,
  type UncertainQuantity,
  type UncertaintyResult,
  type UncertaintySampleSettings,
  type UncertaintySettings
} from '../../src-core/index.ts'
import { Chart, type Line } from '../charts/Chart.tsx'
import { drawVertical } from '../charts/heatGrid.ts'
import { forcingColour, type Theme } from '../charts/palette.ts'
import { affectsOptics, problemsOf, sampleKey } from '../compute/client.ts'
import type { ToolProblem } from '../compute/toolMessages.ts'
import { runUncertaintyFor, stopRun } from '../compute/tools.ts'
import { Field, problemAt, readNumber, readOptional } from '../edit/Field.tsx'
import { screenName } from '../edit/fieldNames.ts'
import { fixed, num, signed } from '../format.ts'
import { sampleState } from '../shown.ts'
import { edit } from '../state/actions.ts'
import { useApp, type AppState } from '../state/store.ts'
import { useTools, type Run } from '../state/tools.ts'

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

function settingsOf(study: Study): UncertaintySettings {
  return (study.uncertainty ?? {}) as UncertaintySettings
}

/** The document path of an input of a list (as the schema's problems name it). */
function inputPath(list: ListName, sampleName: string, j: number): string {
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

function InputList(p: { list: ListName; sample: Sample; inputs: UncertainInput[]; problem?: ToolProblem }) {
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

function RunSettings(p: { u: UncertaintySettings }) {
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

/** The inputs a run depends on. */
function runKey(study: Study, i: number): string {
  const u = settingsOf(study)
  const name = study.samples[i].name
  return JSON.stringify([sampleKey(study, i), u.draws, u.seed, u.sampling, u.precision, u.min_draws, u.samples?.[name] ?? null, u.site ?? null])
}

const pct = (p: number) => `${num(p * 100, 3)} %`

function Probability(p: { r: UncertaintyResult; verdict?: string; stale: boolean }) {
  const w = p.r.warming
  const forcing = p.r.figures.find((f) => f.key === UNCERTAINTY_VERDICT_FIGURE)
  const word = w.probability >= 0.95 ? 'warms' : w.probability <= 0.05 ? 'cools' : 'undecided'
  const head =
    w.positives === 0
      ? 'No draw warms'
      : w.positives === w.count
        ? 'Every draw warms'
        : w.probability > 0.5
          ? `Warms in ${pct(w.probability)} of the draws`
          : `Cools in ${pct(1 - w.probability)} of the draws`
  const status =
    p.r.status === 'precision reached'
      ? `stopped early after ${p.r.draws} of at most ${p.r.requested_draws} draws: P(warm) was settled to the precision asked for`
      : p.r.status === 'cancelled'
        ? `cancelled after ${p.r.draws} of ${p.r.requested_draws} draws; the figures are from those draws only`
        : `all ${p.r.draws} draws made`
  return (
    <section class={`verdict u-verdict v-${word === 'warms' ? 'warms' : word === 'cools' ? 'cools' : 'too-close-to-call'}${p.stale ? ' is-stale' : ''}`} data-testid="p-warm" data-probability={w.probability} data-status={p.r.status} data-draws={p.r.draws} aria-live="polite">
      <h3>
        <span class="verdict-word">{head}</span>
        {p.stale && <span class="stale-tag">stale</span>}
      </h3>
      <p class="explanation">
        P(warm), the probability that this layer warms (net forcing, sunlight + infrared, above 0), is <strong data-testid="p-warm-value">{fixed(w.probability, 3)}</strong> ± {fixed(w.standard_error, 3)} (binomial standard error): {w.positives} of {w.count} draws warm.
        {w.positives === 0 || w.positives === w.count ? ' With every draw on one side the standard error is 0; it only shows that the other outcome is rare, not impossible.' : ''}
      </p>
      <p class="explanation">
        The plain calculation gives {signed(forcing?.central)} W m⁻²{p.verdict ? <Fragment>; the verdict in “Warming or cooling” is <strong data-testid="plain-verdict">{p.verdict}</strong></Fragment> : ''}. Run: {status}; seed {p.r.seed},{' '}
        {p.r.sampling === 'latin-hypercube' ? 'Latin hypercube' : 'simple random'} sampling.
      </p>
    </section>
  )
}

function Histogram(p: { r: UncertaintyResult; theme: Theme; stale: boolean }) {
  const chart = useMemo(() => {
    const f = p.r.figures.find((x) => x.key === UNCERTAINTY_VERDICT_FIGURE)
    if (!f) return null
    let { edges, counts } = f.histogram
    if (counts.length === 1) {
      // Every draw gave the same forcing: one bar, with empty neighbours to give it a width.
      const w = Math.max(Math.abs(edges[0]) * 0.05, 0.01)
      edges = [edges[0] - 1.5 * w, edges[0] - 0.5 * w, edges[0] + 0.5 * w, edges[0] + 1.5 * w]
      counts = [0, counts[0], 0]
    }
    const centres = counts.map((_, j) => (edges[j] + edges[j + 1]) / 2)
    const lo = Math.min(edges[0], 0)
    const hi = Math.max(edges[edges.length - 1], 0)
    const pad = (hi - lo) * 0.06 || 0.05
    const cool = forcingColour(-0.85, p.theme)
    const warm = forcingColour(0.85, p.theme)
    const ink = p.theme === 'light' ? '#14171a' : '#eef1f4'
    const lines: Line[] = [
      { label: 'draws that cool (forcing < 0)', stroke: cool, fill: cool, bars: true },
      { label: 'draws that warm (forcing > 0)', stroke: warm, fill: warm, bars: true },
      { label: 'zero forcing', stroke: ink, dash: [6, 4] }
    ]
    return {
      data: [centres, counts.map((c, j) => (centres[j] <= 0 ? c : null)), counts.map((c, j) => (centres[j] > 0 ? c : null)), centres.map(() => null)],
      lines,
      xRange: [lo - pad, hi + pad] as [number, number],
      yRange: [0, Math.max(...counts) * 1.15] as [number, number],
      over: drawVertical(0, ink, p.theme, '← cools', 'warms →'),
      bins: f.histogram.counts.filter((c) => c > 0).length
    }
  }, [p.r, p.theme])
  if (!chart) return null
  return (
    <div data-testid="forcing-histogram" data-bins={chart.bins} data-zero={chart.xRange[0] <= 0 && chart.xRange[1] >= 0 ? 'inside' : 'outside'}>
    <Chart
      name="forcing-histogram"
      title={`Net forcing (sunlight + infrared) over ${p.r.draws} draws`}
      data={chart.data}
      lines={chart.lines}
      xLabel="Forcing (W m⁻²)"
      yLabel="Draws"
      xRange={chart.xRange}
      yRange={chart.yRange}
      theme={p.theme}
      stale={p.stale}
      height={220}
      drawOver={chart.over}
    />
    </div>
  )
}

const FIGURE_NAMES: Record<string, string> = {
  ext: 'σext, extinction',
  sca: 'σsca, scattering',
  abs: 'σabs, absorption',
  ssa: 'ω, single-scattering albedo',
  g: 'g, asymmetry parameter',
  upscatter: 'β̄, upscatter fraction',
  tau: 'τ, optical depth of the layer',
  forcing: 'Forcing, thin layer (the verdict’s sunlight part)',
  forcing_daily_mean: 'Forcing, thin layer through the site’s day',
  forcing_two_stream_toa: 'Forcing, two-stream at the top of the atmosphere',
  longwave_toa: 'Forcing, thermal infrared at the top of the atmosphere',
  net_toa: 'Net forcing, sunlight + infrared (the verdict’s)'
}

function FiguresTable(p: { r: UncertaintyResult }) {
  const f = (x: number, key: string) => (key.startsWith('forcing') || key.endsWith('_toa') ? signed(x) : key === 'ssa' || key === 'g' || key === 'upscatter' ? fixed(x, 3) : num(x, 4))
  return (
    <table class="grid-table numbers u-figures" data-testid="uncertainty-table">
      <caption>Each figure at {p.r.wavelength_nm} nm over the draws</caption>
      <thead>
        <tr>
          <th scope="col">Figure</th>
          <th scope="col">Unit</th>
          <th scope="col" title="Without any perturbation">Plain</th>
          <th scope="col">Median</th>
          <th scope="col" title="5th to 95th percentile of the draws">5–95 % range</th>
          <th scope="col">Mean ± sd</th>
        </tr>
      </thead>
      <tbody>
        {p.r.figures.map((x) => (
          <tr key={x.key} data-figure={x.key}>
            <th scope="row" title={x.label}>
              {FIGURE_NAMES[x.key] ?? x.label}
            </th>
            <td class="text">{x.unit}</td>
            <td>{f(x.central, x.key)}</td>
            <td data-col="median">{f(x.median, x.key)}</td>
            <td data-col="range">
              {f(x.p05, x.key)} to {f(x.p95, x.key)}
            </td>
            <td>
              {f(x.mean, x.key)} ± {num(x.sd, 2)}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  )
}

function SensitivityTable(p: { r: UncertaintyResult }) {
  const reading = (rho: number | null) =>
    rho === null ? 'did not vary' : Math.abs(rho) < 0.1 ? 'little monotonic effect' : rho > 0 ? `higher → warmer${Math.abs(rho) > 0.7 ? ' (dominant)' : ''}` : `higher → cooler${Math.abs(rho) > 0.7 ? ' (dominant)' : ''}`
  return (
    <table class="grid-table numbers u-sensitivity" data-testid="sensitivity-table">
      <caption>Which inputs matter: Spearman rank correlation ρ of each drawn input with the net forcing (sunlight + infrared), strongest first (±1: it alone orders the forcing; 0: no monotonic effect)</caption>
      <thead>
        <tr>
          <th scope="col">Input</th>
          <th scope="col" title="The drawn factor, offset or value: median and 5–95 % range">Drawn value</th>
          <th scope="col">ρ (Spearman)</th>
          <th scope="col">Reading</th>
        </tr>
      </thead>
      <tbody>
        {p.r.sensitivity.ranking.map((e, k) => {
          const v = p.r.inputs.find((x) => x.label === e.label)?.variate
          return (
            <tr key={k} data-input-label={e.label}>
              <th scope="row">{e.label}</th>
              <td>{v ? `${num(v.median, 3)} (${num(v.p05, 3)} to ${num(v.p95, 3)})` : '—'}</td>
              <td data-col="rho">{e.rho === null ? '—' : signed(e.rho, 2)}</td>
              <td class="text">{reading(e.rho)}</td>
            </tr>
          )
        })}
      </tbody>
    </table>
  )
}

function RunBar(p: { run?: Run<UncertaintyResult>; blocked: string | null; onRun: () => void }) {
  const r = p.run
  return (
    <div class="tool-run" role="group" aria-label="Monte Carlo run">
      <button type="button" class="primary" data-testid="uncertainty-run" disabled={!!p.blocked || r?.running} onClick={p.onRun}>
        Run Monte Carlo
      </button>
      {r?.running && (
        <Fragment>
          <progress max={r.total || 1} value={r.done} aria-label="Draws made" data-testid="uncertainty-progress" />
          <span class="run-status" data-testid="uncertainty-progress-text">
            {r.done}/{r.total || '…'} draws{r.warm !== undefined ? `, P(warm) so far ${fixed(r.warm, 3)} ± ${fixed(r.standardError, 3)}` : ''}
            {r.cancelling ? ' · stopping…' : ''}
          </span>
          <button type="button" data-testid="uncertainty-cancel" disabled={r.cancelling} onClick={() => stopRun('uncertainty')}>
            Cancel
          </button>
        </Fragment>
      )}
      {!r?.running && p.blocked && <span class="help" data-testid="run-blocked">{p.blocked}</span>}
      {!r?.running && r?.stopped && <span class="help">{r.stopped}</span>}
    </div>
  )
}

export function UncertaintyView() {
  const s = useApp()
  const t = useTools()
  const sel = sampleState(s, s.selected)
  if (!sel) return <p class="empty">No sample selected.</p>
  const sample = sel.sample
  const u = settingsOf(s.study)
  const mine = u.samples?.[sample.name]?.inputs ?? []
  const site = u.site?.inputs ?? []
  const run = t.uncertainty[sel.id]
  const key = runKey(s.study, sel.index)
  const stale = !!run?.result && run.key !== key
  const blocked = blockedReason(s, sel.index, mine.length + site.length)
  const problem = run && !run.running && run.key === key ? run.problem : undefined
  const otherProblems = s.problems.filter((q) => !affectsOptics(q.path) && !q.path.startsWith(inputPath('sample', sample.name, 0).replace(/\[0\]$/, '')) && !q.path.startsWith('uncertainty.site') && !/^uncertainty\.(draws|seed|sampling|precision|min_draws)$/.test(q.path))
  return (
    <div class="view tool-view uncertainty-view" data-view="uncertainty">
      <p class="help intro">
        Monte Carlo: each draw perturbs the inputs below, computes “{sample.name}” at {UNCERTAINTY_WAVELENGTH_NM} nm and its forcing at the site. The share of draws whose net forcing (the thin-layer sunlight figure plus the infrared one) is above zero is P(warm). The inputs are saved with the study.
      </p>
      <div class="u-columns">
        <div class="u-editor">
          <InputList list="sample" sample={sample} inputs={mine} problem={problem} />
          <InputList list="site" sample={sample} inputs={site} problem={problem} />
          <fieldset>
            <legend>Run</legend>
            <RunSettings u={u} />
            {otherProblems.length > 0 && (
              <ul class="problems">
                {otherProblems.map((q, k) => (
                  <li key={k}>
                    <span class="where">{screenName(s.study, q.path)}</span>: {q.message}. {q.fix}
                  </li>
                ))}
              </ul>
            )}
            <RunBar run={run} blocked={blocked} onRun={() => runUncertaintyFor(sel.id, s.study, sample.name, key)} />
            {problem && problem.row === undefined && (
              <p class="field-error" role="alert" data-testid="run-problem">
                {problem.where}: {problem.message}. {problem.fix}
              </p>
            )}
          </fieldset>
        </div>
      </div>
      {run?.result && (
        <section class="u-results" aria-label="Monte Carlo results" data-testid="uncertainty-results">
          {stale && <p class="stale-note" role="status">The inputs changed since this run (shown below); run again for current figures.</p>}
          <div class="u-top">
            <Probability r={run.result} verdict={sel.result && !sel.stale ? sel.result.forcing.verdict : undefined} stale={stale} />
            <Histogram r={run.result} theme={s.theme} stale={stale} />
          </div>
          <FiguresTable r={run.result} />
          <SensitivityTable r={run.result} />
          <ul class="notes">
            {run.result.notes.map((n, k) => (
              <li key={k}>{n}</li>
            ))}
          </ul>
        </section>
      )}
    </div>
  )
}

/** Why the run cannot start now, or null. */
function blockedReason(s: AppState, i: number, inputs: number): string | null {
  if (!inputs) return 'Add an uncertain input to run.'
  if (problemsOf(s.problems, i).length || Object.keys(s.drafts).some((p) => affectsOptics(p) && (!p.startsWith('samples[') || p.startsWith(`samples[${i}]`)))) return 'Fix the sample’s marked inputs first.'
  if (s.problems.some((p) => !affectsOptics(p.path)) || Object.keys(s.drafts).some((p) => !affectsOptics(p))) return 'Fix the marked uncertainty fields first.'
  return null
}
