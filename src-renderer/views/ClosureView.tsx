// Index from measurements (optical closure): the selected sample's size distribution taken as measured, measured
// scattering and absorption (and backscatter fraction) at one to three wavelengths, and the effective refractive
// index n + ik that reproduces them, with its uncertainty, the other solutions when it is not unique, and the
// χ² map over (n, log k).
import { Fragment } from 'preact'
import { useMemo } from 'preact/hooks'
import { InputError, K_FLOOR, type ClosureMeasurement, type ClosureResult, type ClosureSolution } from '../../src-core/index.ts'
import { Chart, type Line } from '../charts/Chart.tsx'
import { drawGridHeat, drawMarkers, rampColour } from '../charts/heatGrid.ts'
import type { Theme } from '../charts/palette.ts'
import { affectsOptics, problemsOf } from '../compute/client.ts'
import type { SampleIndex } from '../compute/toolMessages.ts'
import { runClosureFor, stopRun } from '../compute/tools.ts'
import { readNumber } from '../edit/Field.tsx'
import { reasonOf, TextField } from '../edit/ToolField.tsx'
import { fixed, num, signed } from '../format.ts'
import { sampleState } from '../shown.ts'
import { useApp } from '../state/store.ts'
import { emptyClosureRow, freshClosureForm, toolStore, useTools, type ClosureForm, type ClosureRow } from '../state/tools.ts'

const MAX_ROWS = 3

const readBlank = (what: string) => (t: string) => (t.trim() === '' ? undefined : readNumber(what)(t))

function readWavelength(t: string): number {
  const v = readNumber('wavelength')(t.replace(/nm$/i, ''))
  if (!(v >= 200 && v <= 40000)) throw new InputError('wavelength', `${v} nm is outside 200 to 40000 nm`, 'Give the wavelength in nm, e.g. 550.')
  return v
}

function readSd(what: string, value: string): (t: string) => number | undefined {
  return (t) => {
    const s = t.trim()
    if (s === '') {
      if (value.trim() !== '') throw new InputError(what, 'a measurement needs its uncertainty', 'Give one standard deviation, in the same unit, or as a percentage such as 5 %.')
      return undefined
    }
    if (s.endsWith('%')) {
      const p = readNumber(what)(s.slice(0, -1))
      const v = readNumber(what)(value)
      return (Math.abs(v) * p) / 100
    }
    return readNumber(what)(s)
  }
}

/** The form's measurements (throws on the first unreadable field). */
function measurementsOf(form: ClosureForm): { scattering: ClosureMeasurement[]; absorption: ClosureMeasurement[]; backscatter: ClosureMeasurement[] } {
  const out = { scattering: [] as ClosureMeasurement[], absorption: [] as ClosureMeasurement[], backscatter: [] as ClosureMeasurement[] }
  for (const r of form.rows) {
    const wl = readWavelength(r.wavelength)
    const add = (list: ClosureMeasurement[], v: string, sd: string, what: string) => {
      const value = readBlank(what)(v)
      const s = readSd(`${what} uncertainty`, v)(sd)
      if (value !== undefined && s !== undefined) list.push({ wavelength_nm: wl, value, sd: s })
    }
    add(out.scattering, r.sca, r.scaSd, 'σsca')
    add(out.absorption, r.abs, r.absSd, 'σabs')
    add(out.backscatter, r.bsf, r.bsfSd, 'backscatter fraction')
  }
  return out
}

function setForm(id: string, change: (f: ClosureForm) => void): void {
  const all = toolStore().get().closureForms
  const f = structuredClone(all[id] ?? freshClosureForm())
  change(f)
  toolStore().set({ closureForms: { ...all, [id]: f } })
}

function MeasurementRow(p: { id: string; j: number; row: ClosureRow; count: number }) {
  const r = p.row
  const set = (k: keyof ClosureRow) => (t: string) => setForm(p.id, (f) => (f.rows[p.j][k] = t))
  const pair = (k: 'sca' | 'abs' | 'bsf', sdKey: 'scaSd' | 'absSd' | 'bsfSd', what: string) => (
    <td>
      <span class="pm">
        <TextField bare name={`closure-${k}-${p.j}`} label={`${what} at row ${p.j + 1}`} value={r[k]} onText={set(k)} error={reasonOf(readBlank(what), r[k])} width="5em" />
        <span aria-hidden="true">±</span>
        <TextField bare name={`closure-${sdKey}-${p.j}`} label={`Uncertainty of ${what} at row ${p.j + 1}`} value={r[sdKey]} onText={set(sdKey)} error={reasonOf(readSd(`${what} uncertainty`, r[k]), r[sdKey])} width="4em" title="One standard deviation, in the same unit, or a percentage such as 5 %" />
      </span>
    </td>
  )
  return (
    <tr data-row={p.j}>
      <td>
        <TextField bare name={`closure-wavelength-${p.j}`} label={`Wavelength of row ${p.j + 1}, nm`} value={r.wavelength} onText={set('wavelength')} error={reasonOf(readWavelength, r.wavelength)} width="4em" />
      </td>
      {pair('sca', 'scaSd', 'σsca')}
      {pair('abs', 'absSd', 'σabs')}
      {pair('bsf', 'bsfSd', 'backscatter fraction')}
      <td>
        <button type="button" class="small ghost" aria-label={`Remove row ${p.j + 1}`} disabled={p.count <= 1} onClick={() => setForm(p.id, (f) => void f.rows.splice(p.j, 1))}>
          ✕
        </button>
      </td>
    </tr>
  )
}

function Solution(p: { s: ClosureSolution; label: string; testid?: string }) {
  const pm = (v: number, sd: number | null, digits: number) => (
    <Fragment>
      {fixed(v, digits)} <span class="muted">± {sd === null ? 'not constrained' : num(sd, 2)}</span>
    </Fragment>
  )
  return (
    <tr data-testid={p.testid} data-n={p.s.n} data-k={p.s.k} data-sd-n={p.s.sd_n ?? ''} data-sd-k={p.s.sd_k ?? ''}>
      <th scope="row">{p.label}</th>
      <td>{pm(p.s.n, p.s.sd_n, 4)}</td>
      <td>{pm(p.s.k, p.s.sd_k, 5)}</td>
      <td>{p.s.chi2 < 1e-6 ? '≈ 0' : num(p.s.chi2, 3)}</td>
      <td class="text">{p.s.on_bounds.length ? `on the edge: ${p.s.on_bounds.join(', ')}` : ''}</td>
    </tr>
  )
}

/** χ² over (n, log k): colours by log(1 + χ² − χ²min), the best fit ● and the other solutions ◆. */
function ChiMap(p: { fit: ClosureResult; theme: Theme; stale: boolean }) {
  const chart = useMemo(() => {
    const g = p.fit.grid
    const y = g.k.map((k) => k + K_FLOOR)
    let min = Infinity
    let max = -Infinity
    for (const row of g.chi2) for (const c of row) if (Number.isFinite(c)) (min = Math.min(min, c)), (max = Math.max(max, c))
    min = Math.min(min, p.fit.best.chi2)
    const top = Math.log10(1 + Math.max(max - min, 1))
    const colour = (c: number) => rampColour(Math.log10(1 + Math.max(0, c - min)) / top)
    const lines: Line[] = [
      { label: 'best fit ○', stroke: p.theme === 'light' ? '#14171a' : '#eef1f4' },
      ...(p.fit.alternatives.length ? [{ label: 'other solutions ◇', stroke: p.theme === 'light' ? '#14171a' : '#eef1f4', dash: [2, 3] }] : [])
    ]
    const markers = [
      { x: p.fit.best.n, y: p.fit.best.k + K_FLOOR, shape: 'circle' as const },
      ...p.fit.alternatives.map((a) => ({ x: a.n, y: a.k + K_FLOOR, shape: 'diamond' as const }))
    ]
    const levels = [0, 2.3, 10, 100, 1000, 1e4].filter((d) => d <= Math.max(max - min, 2.3))
    return {
      data: [g.n, ...lines.map(() => g.n.map(() => null))],
      lines,
      under: drawGridHeat(g.n, y, g.chi2, colour, true),
      over: drawMarkers(markers),
      xRange: [g.n[0], g.n[g.n.length - 1]] as [number, number],
      yRange: [y[0], y[y.length - 1]] as [number, number],
      yTicks: [1e-4, 1e-3, 1e-2, 0.1, 1, 10].filter((v) => v >= y[0] * 0.999 && v <= y[y.length - 1] * 1.001),
      key: levels.map((d) => ({ d, colour: rampColour(Math.log10(1 + d) / top) }))
    }
  }, [p.fit, p.theme])
  return (
    <div class="map-wrap">
      <Chart
        name="chi2-map"
        title="χ² over n and k (dark: fits the measurements)"
        data={chart.data}
        lines={chart.lines}
        xLabel="Real index n"
        yLabel={`k + ${K_FLOOR}`}
        yLog
        yTicks={chart.yTicks}
        xRange={chart.xRange}
        yRange={chart.yRange}
        theme={p.theme}
        stale={p.stale}
        height={260}
        drawUnder={chart.under}
        drawOver={chart.over}
      />
      <div class="map-key" aria-label="Colour key: χ² above the best">
        χ² − χ²min:
        {chart.key.map((k) => (
          <Fragment key={k.d}>
            <span class="key-swatch" style={{ background: k.colour }} /> {k.d}
          </Fragment>
        ))}
      </div>
    </div>
  )
}

function Results(p: { fit: ClosureResult; own: SampleIndex[]; theme: Theme; stale: boolean }) {
  const f = p.fit
  const notUnique = !f.unique
  return (
    <section class="closure-results" aria-label="Retrieved index" data-testid="closure-results">
      <div class="closure-grid">
        <div>
          <div class={`closure-answer${notUnique ? ' not-unique' : ''}${p.stale ? ' is-stale' : ''}`}>
            <h3>
              {notUnique ? 'Best of several: ' : ''}m = {fixed(f.best.n, 3)} + {num(f.best.k, 3)}i
              {p.stale && <span class="stale-tag">stale</span>}
            </h3>
            <p class="explanation">
              Effective index of the dry particles as measured (homogeneous spheres, the same at every wavelength).{' '}
              {f.dof > 0
                ? `χ² = ${num(f.best.chi2, 3)} for ${f.dof} degree${f.dof === 1 ? '' : 's'} of freedom.`
                : `${f.best.fits.length} measurement${f.best.fits.length === 1 ? '' : 's'} for two unknowns (n and k): ${f.best.chi2 < 1e-6 ? 'fitted exactly' : `χ² = ${num(f.best.chi2, 3)}`}, which says nothing about the fit’s quality.`}
            </p>
          </div>
          {f.warnings.length > 0 && (
            <div class={`closure-warnings${notUnique ? ' not-unique' : ''}`} role="alert" data-testid="closure-warnings" data-unique={f.unique ? 'true' : 'false'}>
              {notUnique && <strong>Not unique: </strong>}
              <ul>
                {f.warnings.map((w, k) => (
                  <li key={k}>{w.replace(/^not unique: /, '')}</li>
                ))}
              </ul>
            </div>
          )}
          {p.own.length > 0 && (
            <p class="help" data-testid="closure-own">
              For comparison, the sample’s own composition: {p.own.map((o) => `${fixed(o.n, 3)} + ${num(o.k, 3)}i at ${o.wavelength_nm} nm`).join('; ')} ({p.own[0].note}).
            </p>
          )}
        </div>
        <ChiMap fit={f} theme={p.theme} stale={p.stale} />
      </div>
      <table class="grid-table numbers" data-testid="closure-solutions">
        <caption>Solutions (± one standard deviation from the curvature of χ²)</caption>
        <thead>
          <tr>
            <th scope="col" />
            <th scope="col">n</th>
            <th scope="col">k</th>
            <th scope="col">χ²</th>
            <th scope="col" />
          </tr>
        </thead>
        <tbody>
          <Solution s={f.best} label="Best fit" testid="closure-best" />
          {f.alternatives.map((a, k) => (
            <Solution key={k} s={a} label={`Other ${k + 1}`} testid="closure-alternative" />
          ))}
        </tbody>
      </table>
      <table class="grid-table numbers" data-testid="closure-fits">
        <caption>How the best fit reproduces each measurement</caption>
        <thead>
          <tr>
            <th scope="col">Measured</th>
            <th scope="col">λ (nm)</th>
            <th scope="col">Value ± sd</th>
            <th scope="col">Model</th>
            <th scope="col">(model − measured)/sd</th>
          </tr>
        </thead>
        <tbody>
          {f.best.fits.map((x, k) => (
            <tr key={k}>
              <th scope="row">{x.quantity === 'scattering' ? 'σsca (Mm⁻¹)' : x.quantity === 'absorption' ? 'σabs (Mm⁻¹)' : 'backscatter fraction'}</th>
              <td>{x.wavelength_nm}</td>
              <td>
                {num(x.measured, 4)} ± {num(x.sd, 2)}
              </td>
              <td>{num(x.model, 4)}</td>
              <td>{signed(x.residual, 2)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <ul class="notes">
        {f.notes.map((n, k) => (
          <li key={k}>{n}</li>
        ))}
      </ul>
    </section>
  )
}

export function ClosureView() {
  const s = useApp()
  const t = useTools()
  const sel = sampleState(s, s.selected)
  if (!sel) return <p class="empty">No sample selected.</p>
  const id = sel.id
  const form = t.closureForms[id] ?? freshClosureForm()
  const run = t.closure[id]
  let measured: ReturnType<typeof measurementsOf> | null = null
  let formProblem: string | null = null
  const range = (what: string, lo: string, hi: string): [number, number] => [readNumber(`${what} from`)(lo), readNumber(`${what} to`)(hi)]
  let nRange: [number, number] = [1.3, 1.8]
  let kRange: [number, number] = [0, 1]
  try {
    measured = measurementsOf(form)
    nRange = range('n', form.nLo, form.nHi)
    kRange = range('k', form.kLo, form.kHi)
    if (!measured.scattering.length && !measured.absorption.length && !measured.backscatter.length) formProblem = 'Enter at least one measurement with its uncertainty.'
  } catch {
    formProblem = 'Fix the marked fields.'
  }
  const sampleBlocked = problemsOf(s.problems, sel.index).length > 0 || Object.keys(s.drafts).some((p) => affectsOptics(p) && p.startsWith(`samples[${sel.index}]`))
  const blocked = sampleBlocked ? 'Fix the sample’s marked inputs first.' : formProblem
  const key = JSON.stringify([sel.sample.size, sel.sample.composition, s.study.user_materials ?? [], measured, nRange, kRange])
  const stale = !!run?.result && run.key !== key
  const problem = run && !run.running ? run.problem : undefined
  const wet = sel.sample.rh_percent > 0
  return (
    <div class="view tool-view closure-view" data-view="closure">
      <p class="help intro">
        Takes the size distribution of “{sel.sample.name}” as measured (dry particles, homogeneous spheres) and finds the one refractive index n + ik that reproduces the coefficients you measured. Give one standard deviation per value (a number, or a percentage such as 5 %).
        {wet && ` Its humidity (${num(sel.sample.rh_percent, 3)} %) is not used: the particles are taken as they were measured.`}
      </p>
      <table class="grid-table closure-table" data-testid="closure-form">
        <caption>Measurements</caption>
        <thead>
          <tr>
            <th scope="col">λ (nm)</th>
            <th scope="col">σsca ± sd (Mm⁻¹)</th>
            <th scope="col">σabs ± sd (Mm⁻¹)</th>
            <th scope="col" title="Hemispheric backscatter fraction σbsp/σsp, optional">Backscatter fraction ± sd (optional)</th>
            <th scope="col">
              <span class="sr-only">Remove</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {form.rows.map((r, j) => (
            <MeasurementRow key={j} id={id} j={j} row={r} count={form.rows.length} />
          ))}
        </tbody>
      </table>
      <div class="row wrap">
        <button type="button" class="small" disabled={form.rows.length >= MAX_ROWS} onClick={() => setForm(id, (f) => void f.rows.push(emptyClosureRow(['450', '550', '700'].find((w) => !f.rows.some((x) => x.wavelength === w)) ?? '')))} data-testid="closure-add-row">
          Add a wavelength
        </button>
        <TextField name="closure-n-lo" label="n from" value={form.nLo} onText={(v) => setForm(id, (f) => (f.nLo = v))} error={reasonOf(readNumber('n from'), form.nLo)} width="3.5em" />
        <TextField name="closure-n-hi" label="n to" value={form.nHi} onText={(v) => setForm(id, (f) => (f.nHi = v))} error={reasonOf(readNumber('n to'), form.nHi)} width="3.5em" />
        <TextField name="closure-k-lo" label="k from" value={form.kLo} onText={(v) => setForm(id, (f) => (f.kLo = v))} error={reasonOf(readNumber('k from'), form.kLo)} width="3.5em" />
        <TextField name="closure-k-hi" label="k to" value={form.kHi} onText={(v) => setForm(id, (f) => (f.kHi = v))} error={reasonOf(readNumber('k to'), form.kHi)} width="3.5em" />
      </div>
      <div class="tool-run" role="group" aria-label="Retrieval">
        <button
          type="button"
          class="primary"
          data-testid="closure-run"
          disabled={!!blocked || run?.running}
          onClick={() => measured && runClosureFor(id, key, { sample: sel.sample, userMaterials: s.study.user_materials ?? [], ...measured, nRange, kRange })}
        >
          Find the index
        </button>
        {run?.running && (
          <Fragment>
            <progress aria-label="Retrieving" data-testid="closure-progress" />
            <span class="run-status">Scanning n and k, then refining…</span>
            <button type="button" data-testid="closure-cancel" onClick={() => stopRun('closure')}>
              Cancel
            </button>
          </Fragment>
        )}
        {!run?.running && blocked && <span class="help">{blocked}</span>}
        {!run?.running && run?.stopped && <span class="help">{run.stopped}</span>}
      </div>
      {problem && (
        <p class="field-error" role="alert" data-testid="closure-problem">
          {problem.where}: {problem.message}. {problem.fix}
        </p>
      )}
      {run?.result && !run.running && <Results fit={run.result.fit} own={run.result.own} theme={s.theme} stale={stale} />}
      {run?.result && run.running && <Results fit={run.result.fit} own={run.result.own} theme={s.theme} stale />}
    </div>
  )
}
