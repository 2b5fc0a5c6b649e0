// Instrument corrections for the selected sample: (a) an integrating nephelometer's angular truncation, from the
// sample's own phase function; (b) an optical particle counter's calibration bin edges re-binned to true diameters
// for the sample's index.
import { Fragment } from 'preact'
import { useEffect } from 'preact/hooks'
import { InputError, parseLength, parseWavelengthList, PSL_INDEX, type RebinResult } from '../../src-core/index.ts'
import { affectsOptics, problemsOf } from '../compute/client.ts'
import type { ToolProblem, TruncationRow } from '../compute/toolMessages.ts'
import { askSampleIndex, runRebinFor, runTruncationFor, stopRun } from '../compute/tools.ts'
import { readNumber } from '../edit/Field.tsx'
import { reasonOf, TextField } from '../edit/ToolField.tsx'
import { diameter as diameterText, fixed, num } from '../format.ts'
import { sampleState, type ShownSample } from '../shown.ts'
import { ResponseChart } from './ResponseChart.tsx'
import { useApp, type AppState } from '../state/store.ts'
import { toolStore, useTools, type CounterForm, type NephelometerForm, type Run } from '../state/tools.ts'

/** A diameter rounded first, so that 0.99999 µm reads 1 µm rather than 1000 nm. */
const diameter = (um: number) => diameterText(Number(um.toPrecision(4)))

const setNeph = (patch: Partial<NephelometerForm>) => toolStore().set({ nephelometer: { ...toolStore().get().nephelometer, ...patch } })
const setCounter = (patch: Partial<CounterForm>) => toolStore().set({ counter: { ...toolStore().get().counter, ...patch } })

function readAngle(what: string): (t: string) => number {
  return (t) => {
    const v = readNumber(what)(t.replace(/°|deg$/i, ''))
    if (!(v >= 0 && v <= 180)) throw new InputError(what, `${v}° is outside 0° to 180°`, 'Give an angle in degrees from 0 to 180.')
    return v
  }
}

/** "7:0.8, 20:1, 170:0.9" → the response table; blank for the ideal sin θ response. */
function readResponse(t: string): { angles_deg: number[]; weight: number[] } | undefined {
  if (t.trim() === '') return undefined
  const angles_deg: number[] = []
  const weight: number[] = []
  for (const item of t.split(/[,;\n]+/).map((x) => x.trim()).filter(Boolean)) {
    const parts = item.split(':')
    if (parts.length !== 2) throw new InputError('response', `"${item}" is not ANGLE:WEIGHT`, 'Write pairs such as 7:0.8, 20:1, 170:0.9 (weight relative to sin θ).')
    angles_deg.push(readNumber('response angle')(parts[0]))
    weight.push(readNumber('response weight')(parts[1]))
  }
  return { angles_deg, weight }
}

/** Wavelengths in nm, comma-separated; bare numbers are in nm; at most 8. */
const readWavelengths = (t: string): number[] => parseWavelengthList(t, 'wavelengths', { max: 8 })

/** Bin edges in µm (bare numbers), ascending. */
function readEdges(t: string): number[] {
  const list = t.split(/[,;\s]+/).filter(Boolean)
  if (list.length < 2) throw new InputError('edges', `${list.length} edge${list.length === 1 ? '' : 's'} given`, 'Give at least two ascending bin edges in µm, e.g. 0.3, 0.5, 1.')
  if (list.length > 40) throw new InputError('edges', `${list.length} edges given`, 'Give at most 40 edges.')
  const edges = list.map((x) => parseLength(x, 'edge', 'um'))
  edges.forEach((e, i) => {
    if (i > 0 && !(e > edges[i - 1])) throw new InputError('edges', `${list[i]} does not follow ${list[i - 1]} in increasing order`, 'Give the edges in increasing order.')
  })
  return edges
}

const readOptionalRh = (t: string) => {
  if (t.trim() === '') return undefined
  const v = readNumber('humidity')(t.replace('%', ''))
  if (!(v >= 0 && v < 100)) throw new InputError('humidity', `${v} % is outside 0 to 100 %`, 'Give the humidity inside the instrument in percent, or leave it blank for the sample’s.')
  return v
}

/** A problem from the core shown at the field it is about (by where it says it is). */
const at = (p: ToolProblem | undefined, pattern: RegExp) => (p && pattern.test(p.where) ? `${p.message}. ${p.fix}` : null)

function sampleBlocked(s: AppState, sel: ShownSample): string | null {
  return problemsOf(s.problems, sel.index).length > 0 || Object.keys(s.drafts).some((p) => affectsOptics(p) && p.startsWith(`samples[${sel.index}]`)) ? 'Fix the sample’s marked inputs first.' : null
}

function RunControls(p: { name: string; label: string; run?: Run<unknown>; blocked: string | null; onRun: () => void; onCancel: () => void; busy: string }) {
  const r = p.run
  return (
    <div class="tool-run" role="group" aria-label={p.label}>
      <button type="button" class="primary" data-testid={`${p.name}-run`} disabled={!!p.blocked || r?.running} onClick={p.onRun}>
        {p.label}
      </button>
      {r?.running && (
        <Fragment>
          {r.total ? <progress max={r.total} value={r.done} aria-label={p.busy} /> : <progress aria-label={p.busy} />}
          <span class="run-status">
            {p.busy}
            {r.total ? ` ${r.done}/${r.total}` : '…'}
          </span>
          <button type="button" data-testid={`${p.name}-cancel`} onClick={p.onCancel}>
            Cancel
          </button>
        </Fragment>
      )}
      {!r?.running && p.blocked && <span class="help">{p.blocked}</span>}
      {!r?.running && r?.stopped && <span class="help">{r.stopped}</span>}
    </div>
  )
}

function Nephelometer(p: { sel: ShownSample }) {
  const s = useApp()
  const t = useTools()
  const f = t.nephelometer
  const id = p.sel.id
  const run = t.truncation[id]
  let input: { lowDeg: number; highDeg: number; response?: { angles_deg: number[]; weight: number[] }; wavelengths: number[]; rhPercent?: number } | null = null
  try {
    input = { lowDeg: readAngle('lowest angle')(f.low), highDeg: readAngle('highest angle')(f.high), response: readResponse(f.response), wavelengths: readWavelengths(f.wavelengths), rhPercent: readOptionalRh(f.rh) }
  } catch {
    input = null
  }
  const blocked = sampleBlocked(s, p.sel) ?? (input ? null : 'Fix the marked fields.')
  const key = JSON.stringify([p.sel.sample, s.study.user_materials ?? [], input])
  const stale = !!run?.result && run.key !== key
  const problem = run && !run.running && run.key === key ? run.problem : undefined
  const shown = new Set<string>()
  const err = (pattern: RegExp) => {
    const m = at(problem, pattern)
    if (m && problem) shown.add(problem.where)
    return m
  }
  const angleProblem = err(/angles/)
  const responseProblem = err(/response/)
  const wlProblem = err(/wavelength/)
  return (
    <fieldset class="instrument" data-testid="nephelometer">
      <legend>Nephelometer truncation</legend>
      <p class="help">An integrating nephelometer sees only part of the scattering angles; C = σ_true/σ_measured corrects its reading, from the sample’s own phase function (Mie theory).</p>
      <p class="help example-note" data-testid="neph-example-note">
        <strong>Example values:</strong> the angles filled in (7–170°) and the wavelengths are those of a typical instrument, not yours. Replace them with your own nephelometer’s figures, from its manual or calibration record.
      </p>
      <div class="row wrap">
        <TextField name="neph-low" label="Lowest angle" value={f.low} onText={(v) => setNeph({ low: v })} error={reasonOf(readAngle('lowest angle'), f.low) ?? angleProblem} hint="°" width="3.5em" />
        <TextField name="neph-high" label="Highest angle" value={f.high} onText={(v) => setNeph({ high: v })} error={reasonOf(readAngle('highest angle'), f.high)} hint="°" width="3.5em" />
        <TextField name="neph-wavelengths" label="Wavelengths" value={f.wavelengths} onText={(v) => setNeph({ wavelengths: v })} error={reasonOf(readWavelengths, f.wavelengths) ?? wlProblem} hint="nm" width="9em" />
        <TextField name="neph-rh" label="Humidity inside" value={f.rh} onText={(v) => setNeph({ rh: v })} error={reasonOf(readOptionalRh, f.rh)} hint={`% (blank: the sample’s, ${num(p.sel.sample.rh_percent, 3)} %)`} width="3.5em" />
      </div>
      <TextField
        name="neph-response"
        label="Angular response relative to sin θ (optional), ANGLE:WEIGHT pairs"
        value={f.response}
        onText={(v) => setNeph({ response: v })}
        error={reasonOf(readResponse, f.response) ?? responseProblem}
        hint="blank: ideal; e.g. 7:0.8, 20:1, 170:0.9"
        width="18em"
      />
      <RunControls name="neph" label="Compute the correction" run={run} blocked={blocked} busy="Wavelength" onRun={() => input && runTruncationFor(id, key, { sample: p.sel.sample, userMaterials: s.study.user_materials ?? [], ...input })} onCancel={() => stopRun('truncation')} />
      {problem && !shown.has(problem.where) && (
        <p class="field-error" role="alert">
          {problem.where}: {problem.message}. {problem.fix}
        </p>
      )}
      {run?.result && <TruncationTable rows={run.result} stale={stale || !!run.running} />}
    </fieldset>
  )
}

function TruncationTable(p: { rows: TruncationRow[]; stale: boolean }) {
  const r0 = p.rows[0]
  return (
    <div class={p.stale ? 'is-stale' : ''}>
      <table class="grid-table numbers" data-testid="truncation-table">
        <caption>
          Correction factors, {r0 ? `${num(r0.low_deg, 4)}°–${num(r0.high_deg, 4)}°, ${r0.ideal_response ? 'ideal sin θ response' : 'the given response'}` : ''}
          {p.stale && <span class="stale-tag">stale</span>}
        </caption>
        <thead>
          <tr>
            <th scope="col">λ (nm)</th>
            <th scope="col" title="σ_true/σ_measured for total scatter (0–180° against the instrument's angles)">C total</th>
            <th scope="col" title="σ_true/σ_measured for hemispheric backscatter (90–180° against 90° to the highest angle)">C backscatter</th>
            <th scope="col">Seen, total</th>
            <th scope="col">Seen, backscatter</th>
            <th scope="col">σsca true (Mm⁻¹)</th>
            <th scope="col">σsca as measured</th>
            <th scope="col">RH inside (%)</th>
          </tr>
        </thead>
        <tbody>
          {p.rows.map((r) => (
            <tr key={r.wavelength_nm} data-wavelength={r.wavelength_nm}>
              <th scope="row">{num(r.wavelength_nm, 5)}</th>
              <td data-col="total" data-value={r.total}>
                {fixed(r.total, 4)}
              </td>
              <td data-col="backscatter" data-value={r.backscatter}>
                {fixed(r.backscatter, 4)}
              </td>
              <td>{num(r.measured_fraction_total * 100, 4)} %</td>
              <td>{num(r.measured_fraction_backscatter * 100, 4)} %</td>
              <td>{num(r.sca_true_mm, 4)}</td>
              <td>{num(r.sca_measured_mm, 4)}</td>
              <td>{num(r.rh_percent, 3)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p class="table-note">Multiply the nephelometer’s reading by C. “Seen” is the share of the true scattering inside the instrument’s angles (1/C).</p>
    </div>
  )
}

function Counter(p: { sel: ShownSample }) {
  const s = useApp()
  const t = useTools()
  const f = t.counter
  const id = p.sel.id
  const run = t.rebin[id]
  const readWl = (x: string) => {
    const v = parseLength(x, 'laser wavelength', 'nm') * 1000
    if (!(v >= 200 && v <= 40000)) throw new InputError('laser wavelength', `${num(v, 5)} nm is outside 200 to 40000 nm`, 'Give the laser wavelength in nm, e.g. 633.')
    return v
  }
  let wl: number | null = null
  try {
    wl = readWl(f.wavelength)
  } catch {
    wl = null
  }
  const indexKey = JSON.stringify([p.sel.sample.composition, s.study.user_materials ?? [], wl])
  useEffect(() => {
    if (f.indexFrom === 'sample' && wl !== null) askSampleIndex(id, indexKey, { sample: p.sel.sample, userMaterials: s.study.user_materials ?? [], wavelengths: [wl] })
  }, [indexKey, f.indexFrom, id])
  const known = t.sampleIndex[id]
  const fromSample = f.indexFrom === 'sample' ? (known?.key === indexKey ? known : undefined) : undefined
  const readK = (what: string) => (x: string) => {
    const v = readNumber(what)(x)
    if (v < 0) throw new InputError(what, `${v} is negative`, 'Give k ≥ 0 (m = n + ik, absorbing for k > 0).')
    return v
  }
  const readN = (what: string) => (x: string) => {
    const v = readNumber(what)(x)
    if (!(v > 0)) throw new InputError(what, `${v} is not above 0`, 'Give n > 0, e.g. 1.53.')
    return v
  }
  let input: { edges: number[]; index: { n: number; k: number }; wavelengthNm: number; lowDeg: number; highDeg: number; calibration: { n: number; k: number } } | null = null
  let formProblem: string | null = null
  try {
    const index = f.indexFrom === 'typed' ? { n: readN('n')(f.n), k: readK('k')(f.k) } : fromSample?.index ? { n: fromSample.index.n, k: fromSample.index.k } : null
    if (!index) formProblem = fromSample?.problem ? 'The sample’s index could not be found; type one.' : 'Finding the sample’s index…'
    else input = { edges: readEdges(f.edges), index, wavelengthNm: readWl(f.wavelength), lowDeg: readAngle('lowest angle')(f.low), highDeg: readAngle('highest angle')(f.high), calibration: { n: readN('calibration n')(f.calN), k: readK('calibration k')(f.calK) } }
  } catch {
    input = null
    formProblem = 'Fix the marked fields.'
  }
  const key = JSON.stringify(input)
  const stale = !!run?.result && run.key !== key
  const problem = run && !run.running && run.key === key ? run.problem : undefined
  const shown = new Set<string>()
  const err = (pattern: RegExp) => {
    const m = at(problem, pattern)
    if (m && problem) shown.add(problem.where)
    return m
  }
  const edgeProblem = err(/optical particle counter: edge/)
  const wlProblem = err(/optical particle counter: wavelength/)
  const angleProblem = err(/optical particle counter: angles/)
  const indexProblem = err(/optical particle counter: sample index/)
  const calProblem = err(/optical particle counter: calibration/)
  return (
    <fieldset class="instrument" data-testid="counter">
      <legend>Optical particle counter re-binning</legend>
      <p class="help">A counter sizes particles by the light they scatter into its optics, calibrated with polystyrene latex (PSL) spheres. Particles of another index scatter differently: each calibration edge maps to the true diameter that scatters as much (Mie theory).</p>
      <p class="help example-note" data-testid="opc-example-note">
        <strong>Example values:</strong> the bin edges, the 633 nm laser and the collection angles filled in are those of a typical counter, not yours. Replace them with your own counter’s figures, from its manual or calibration certificate.
      </p>
      <TextField name="opc-edges" label="Bin edges as calibrated (µm)" value={f.edges} onText={(v) => setCounter({ edges: v })} error={reasonOf(readEdges, f.edges) ?? edgeProblem} hint="ascending; bare numbers in µm" width="22em" />
      <div class="row wrap">
        <TextField name="opc-wavelength" label="Laser wavelength" value={f.wavelength} onText={(v) => setCounter({ wavelength: v })} error={reasonOf(readWl, f.wavelength) ?? wlProblem} hint="nm" width="4em" />
        <TextField name="opc-low" label="Collection from" value={f.low} onText={(v) => setCounter({ low: v })} error={reasonOf(readAngle('lowest angle'), f.low) ?? angleProblem} hint="°" width="3.5em" />
        <TextField name="opc-high" label="to" value={f.high} onText={(v) => setCounter({ high: v })} error={reasonOf(readAngle('highest angle'), f.high)} hint="° from the beam" width="3.5em" />
        <TextField name="opc-cal-n" label="Calibration n" value={f.calN} onText={(v) => setCounter({ calN: v })} error={reasonOf(readN('calibration n'), f.calN) ?? calProblem} width="3.5em" title={`PSL: ${PSL_INDEX.n}`} />
        <TextField name="opc-cal-k" label="k" value={f.calK} onText={(v) => setCounter({ calK: v })} error={reasonOf(readK('calibration k'), f.calK)} hint={`(PSL: ${PSL_INDEX.n} + ${PSL_INDEX.k}i)`} width="3.5em" />
      </div>
      <div class="index-choice" role="radiogroup" aria-label="Index of the sampled particles">
        <label class="radio">
          <input type="radio" name="opc-index" value="sample" checked={f.indexFrom === 'sample'} onChange={() => setCounter({ indexFrom: 'sample' })} data-testid="opc-index-sample" />
          Index of “{p.sel.sample.name}” at the laser wavelength:{' '}
          <strong data-testid="opc-sample-index">{fromSample?.index ? `${fixed(fromSample.index.n, 3)} + ${num(fromSample.index.k, 3)}i` : fromSample?.problem ? 'not found' : '…'}</strong>
        </label>
        <div class="row">
        <label class="radio">
          <input type="radio" name="opc-index" value="typed" checked={f.indexFrom === 'typed'} onChange={() => setCounter({ indexFrom: 'typed' })} data-testid="opc-index-typed" />
          typed:
        </label>
        <TextField bare name="opc-n" label="Typed n" value={f.n} onText={(v) => setCounter({ n: v, indexFrom: 'typed' })} error={f.indexFrom === 'typed' ? (reasonOf(readN('n'), f.n) ?? indexProblem) : null} width="3.5em" />
        <span aria-hidden="true">+</span>
        <TextField bare name="opc-k" label="Typed k" value={f.k} onText={(v) => setCounter({ k: v, indexFrom: 'typed' })} error={f.indexFrom === 'typed' ? reasonOf(readK('k'), f.k) : null} width="4.5em" />
        <span aria-hidden="true">i</span>
        </div>
      </div>
      {f.indexFrom === 'sample' && fromSample?.index && <p class="help">{fromSample.index.note}.</p>}
      {f.indexFrom === 'sample' && fromSample?.problem && (
        <p class="field-error" role="alert">
          {fromSample.problem.where}: {fromSample.problem.message}. {fromSample.problem.fix}
        </p>
      )}
      <RunControls name="opc" label="Re-bin the edges" run={run} blocked={sampleBlocked(s, p.sel) && f.indexFrom === 'sample' ? sampleBlocked(s, p.sel) : formProblem} busy="Scanning diameters" onRun={() => input && runRebinFor(id, key, input)} onCancel={() => stopRun('rebin')} />
      {problem && !shown.has(problem.where) && (
        <p class="field-error" role="alert">
          {problem.where}: {problem.message}. {problem.fix}
        </p>
      )}
      {run?.result && <RebinTables r={run.result} stale={stale || !!run.running} />}
    </fieldset>
  )
}

function RebinTables(p: { r: RebinResult; stale: boolean }) {
  const r = p.r
  const flagged = r.bins.filter((b) => b.flagged).length
  return (
    <div class={p.stale ? 'is-stale' : ''}>
      <ResponseChart r={r} stale={p.stale} />
      <table class="grid-table numbers rebin-table" data-testid="rebin-edges">
        <caption>
          Edges: calibration ({fixed(r.calibration_index.n, 3)} + {num(r.calibration_index.k, 3)}i) → sample ({fixed(r.sample_index.n, 3)} + {num(r.sample_index.k, 3)}i) at {num(r.wavelength_nm, 5)} nm, {num(r.low_deg, 4)}°–{num(r.high_deg, 4)}°
          {p.stale && <span class="stale-tag">stale</span>}
        </caption>
        <thead>
          <tr>
            <th scope="col">Calibration edge</th>
            <th scope="col">True edge</th>
            <th scope="col">True/calibration</th>
            <th scope="col">Every diameter with the same response (candidates)</th>
          </tr>
        </thead>
        <tbody>
          {r.edges.map((e, k) => (
            <tr key={k} data-edge={k} data-calibration={e.calibration_um} data-true={e.true_um} class={e.ambiguous ? 'flagged' : ''}>
              <th scope="row">{diameter(e.calibration_um)}</th>
              <td data-col="true">{diameter(e.true_um)}</td>
              <td>{fixed(e.true_um / e.calibration_um, 3)}</td>
              <td class="text">
                {e.ambiguous ? (
                  <Fragment>
                    <span class="flag" aria-hidden="true">
                      ⚠
                    </span>{' '}
                    {e.candidates_um.length > 1 ? `sample: ${e.candidates_um.map(diameter).join(', ')}` : ''}
                    {e.calibration_candidates_um.length > 1 ? `${e.candidates_um.length > 1 ? '; ' : ''}calibration spheres of ${e.calibration_candidates_um.map(diameter).join(', ')} give it too` : ''}
                  </Fragment>
                ) : (
                  'this one only'
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <table class="grid-table numbers rebin-table" data-testid="rebin-bins">
        <caption>
          Bins: {flagged ? `${flagged} of ${r.bins.length} flagged (⚠), where the response is not monotonic in diameter` : `none of ${r.bins.length} flagged`}
        </caption>
        <thead>
          <tr>
            <th scope="col">As calibrated</th>
            <th scope="col">True</th>
            <th scope="col">Flag</th>
          </tr>
        </thead>
        <tbody>
          {r.bins.map((b, k) => (
            <tr key={k} data-bin={k} data-flagged={b.flagged ? 'true' : 'false'} class={b.flagged ? 'flagged' : ''}>
              <th scope="row">
                {diameter(b.calibration_lo_um)} – {diameter(b.calibration_hi_um)}
              </th>
              <td>
                {diameter(b.true_lo_um)} – {diameter(b.true_hi_um)}
              </td>
              <td class="text">{b.flagged ? `⚠ ${b.reasons.join('; ')}` : '—'}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <ul class="notes">
        {r.notes.map((n, k) => (
          <li key={k}>{n}</li>
        ))}
      </ul>
    </div>
  )
}

export function InstrumentView() {
  const s = useApp()
  const sel = sampleState(s, s.selected)
  if (!sel) return <p class="empty">No sample selected.</p>
  return (
    <div class="view tool-view instrument-view" data-view="instruments">
      <p class="help intro">Corrections for “{sel.sample.name}” as two common instruments would see it.</p>
      <div class="instrument-grid">
        <Nephelometer sel={sel} />
        <Counter sel={sel} />
      </div>
    </div>
  )
}
