// How sure is the verdict: the selected sample's uncertain inputs (UncertaintyInputs.tsx), a Monte Carlo run in the
// tools worker, and what it says (UncertaintyResults.tsx).
import { Fragment } from 'preact'
import { UNCERTAINTY_WAVELENGTH_NM, type Study, type UncertaintyResult } from '../../src-core/index.ts'
import { affectsOptics, problemsOf, sampleKey } from '../compute/client.ts'
import { runUncertaintyFor, stopRun } from '../compute/tools.ts'
import { screenName } from '../edit/fieldNames.ts'
import { fixed } from '../format.ts'
import { sampleState } from '../shown.ts'
import { useApp, type AppState } from '../state/store.ts'
import { useTools, type Run } from '../state/tools.ts'
import { InputList, inputPath, RunSettings, settingsOf } from './UncertaintyInputs.tsx'
import { FiguresTable, Histogram, Probability, SensitivityTable } from './UncertaintyResults.tsx'

/** The inputs a run depends on. */
function runKey(study: Study, i: number): string {
  const u = settingsOf(study)
  const name = study.samples[i].name
  return JSON.stringify([sampleKey(study, i), u.draws, u.seed, u.sampling, u.precision, u.min_draws, u.samples?.[name] ?? null, u.site ?? null])
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
