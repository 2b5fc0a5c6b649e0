// The station record: the campaign's instrument files with their reading summaries, the merge parameters, the
// record over time in stacked charts, a marked stretch made into a sample, and the record's exports.
import { useState } from 'preact/hooks'
import { CAMPAIGN_FILE_KINDS, DEFAULT_NEPHELOMETER_ANGLES, readDateTime, recordCsv, type CampaignFileSummary, type CampaignSettings } from '../../src-core/index.ts'
import { host } from '../host/index.ts'
import { addFiles, acceptChanged, prepareRecordWorker, campaignStore, kindWords, makeSample, pointAgain, refresh, removeFile, setKind, setMark, setParameter, stopRecord } from '../campaign/session.ts'
import { RecordCharts, recordPng, zoomControls } from '../campaign/RecordCharts.tsx'
import { fileStem } from '../format.ts'
import { store, useApp } from '../state/store.ts'
import { useEffect } from 'preact/hooks'

function useSession() {
  const s = campaignStore()
  const [, setTick] = useState(0)
  useEffect(() => s.subscribe(() => setTick((t) => t + 1)), [s])
  return s.get()
}

/** A typed number kept as typed; committed when it reads, its reason shown when it does not. */
function ParamField(p: { label: string; value: number | undefined; unit: string; testId: string; read: (v: number) => string | null; commit: (v: number | undefined) => void; optional?: boolean; hint?: string }) {
  const [text, setText] = useState<string | null>(null)
  const shown = text ?? (p.value === undefined ? '' : String(p.value))
  const problem = (() => {
    if (text === null) return null
    const t = text.trim()
    if (t === '') return p.optional ? null : `${p.label} is needed`
    const v = Number(t.replace(',', '.'))
    if (!Number.isFinite(v)) return `“${t}” is not a number`
    return p.read(v)
  })()
  const done = () => {
    if (text === null || problem) return
    const t = text.trim()
    p.commit(t === '' ? undefined : Number(t.replace(',', '.')))
    setText(null)
  }
  return (
    <label class={`record-param${problem ? ' has-problem' : ''}`} title={p.hint}>
      <span>{p.label}</span>
      <input type="text" inputMode="decimal" value={shown} data-testid={p.testId} onInput={(e) => setText((e.target as HTMLInputElement).value)} onBlur={done} onKeyDown={(e) => e.key === 'Enter' && done()} aria-invalid={problem ? 'true' : 'false'} />
      <span class="unit">{p.unit}</span>
      {problem && <span class="field-problem" role="alert">{problem}</span>}
    </label>
  )
}

function FileSummary(p: { f: CampaignFileSummary }) {
  const f = p.f
  if (!f.ok) {
    return (
      <div class="record-file-problem" role="alert" data-testid="record-file-refused">
        <strong>Refused:</strong> {f.error?.where}: {f.error?.problem}. <em>Fix:</em> {f.error?.fix}
      </div>
    )
  }
  return (
    <div class="record-file-summary" data-testid="record-file-summary">
      <span data-testid="record-file-rows">
        {f.rows} rows{f.bins > 0 ? `, ${f.bins} bins` : `, ${f.channels.join(', ')}`}
      </span>
      <span data-testid="record-file-time">
        {f.firstTime} to {f.lastTime}
        {f.interval ? `, every ${f.interval}` : ''}
      </span>
      {f.ignoredColumns.length > 0 && <span data-testid="record-file-ignored">ignored columns: {f.ignoredColumns.map((c) => `“${c}”`).join(', ')}</span>}
      {f.humidity && (
        <span data-testid="record-file-humidity">
          relative humidity in {f.humidity.column}: {f.humidity.rows} row{f.humidity.rows === 1 ? '' : 's'} with a value
          {f.humidity.leftOut > 0 ? `, ${f.humidity.leftOut} value${f.humidity.leftOut === 1 ? '' : 's'} left out` : ''}
        </span>
      )}
      {f.humidity && f.humidity.reasons.length > 0 && (
        <details>
          <summary>Why humidity values were left out</summary>
          <ul>
            {f.humidity.reasons.map((r, i) => (
              <li key={i}>
                line {r.line}
                {r.column !== undefined ? ` column ${r.column}` : ''}: {r.reason} <em>Fix:</em> {r.fix}
              </li>
            ))}
            {f.humidity.leftOut > f.humidity.reasons.length && <li>… and {f.humidity.leftOut - f.humidity.reasons.length} more</li>}
          </ul>
        </details>
      )}
      <span data-testid="record-file-left-out">{f.leftOut} row{f.leftOut === 1 ? '' : 's'} left out</span>
      {f.reasons.length > 0 && (
        <details>
          <summary>Why rows were left out</summary>
          <ul>
            {f.reasons.map((r, i) => (
              <li key={i}>
                line {r.line}
                {r.column !== undefined ? ` column ${r.column}` : ''}: {r.reason} <em>Fix:</em> {r.fix}
              </li>
            ))}
            {f.leftOut > f.reasons.length && <li>… and {f.leftOut - f.reasons.length} more</li>}
          </ul>
        </details>
      )}
      {f.notes.length > 0 && <span class="muted">{f.notes.join('; ')}</span>}
    </div>
  )
}

function Files(p: { c: CampaignSettings | undefined }) {
  const s = useSession()
  const files = p.c?.files ?? []
  const add = async () => {
    const got = await host().openInstrumentFiles()
    if (got) await addFiles(got)
  }
  return (
    <section class="record-files" aria-label="Instrument files">
      <div class="record-row">
        <h3>Instrument files</h3>
        <button type="button" onClick={() => void add()} data-testid="record-add-files" title="Sizer exports, a merged distribution, a nephelometer's and an absorption photometer's files (you can also drop them on this view)">
          Add instrument files…
        </button>
      </div>
      {files.length === 0 && <p class="muted">No files yet. Add the station's sizer exports (mobility, aerodynamic, optical counter, or one merged file) and, beside them, the nephelometer's scattering and the absorption photometer's files; or drop them here.</p>}
      <ul class="record-file-list">
        {files.map((ref, i) => {
          const summary = s.build?.files.find((f) => f.name === (s.texts[ref.path]?.name ?? ''))
          const missing = s.missing[ref.path]
          const changed = s.changed[ref.path]
          return (
            <li key={ref.path + i} data-testid="record-file" data-kind={ref.kind}>
              <div class="record-row">
                <select value={ref.kind} onChange={(e) => setKind(i, (e.target as HTMLSelectElement).value as typeof ref.kind)} aria-label={`What ${ref.path} holds`} data-testid="record-file-kind">
                  {CAMPAIGN_FILE_KINDS.map((k) => (
                    <option key={k} value={k}>
                      {kindWords[k]}
                    </option>
                  ))}
                </select>
                <code class="record-path" title={ref.path}>
                  {ref.path}
                </code>
                <button type="button" class="small ghost" onClick={() => removeFile(i)} aria-label={`Remove ${ref.path} from the campaign`}>
                  Remove
                </button>
              </div>
              {missing && (
                <div class="record-file-problem" role="alert" data-testid="record-file-missing">
                  <strong>Not found:</strong> {ref.path} ({missing}).{' '}
                  <button type="button" class="small" onClick={() => void pointAgain(i)} data-testid="record-point-again">
                    Point at the file…
                  </button>
                </div>
              )}
              {changed && (
                <div class="record-file-problem" role="status" data-testid="record-file-changed">
                  <strong>Changed:</strong> {ref.path}: {changed}; the record uses it as it is now.{' '}
                  <button type="button" class="small" onClick={() => acceptChanged(i)}>
                    Keep this version
                  </button>{' '}
                  <button type="button" class="small" onClick={() => void pointAgain(i)}>
                    Point at another file…
                  </button>
                </div>
              )}
              {summary && <FileSummary f={summary} />}
            </li>
          )
        })}
      </ul>
    </section>
  )
}

function Parameters(p: { c: CampaignSettings }) {
  const s = useApp()
  const c = p.c
  const hasOptical = c.files.some((f) => f.kind === 'optical')
  const hasScattering = c.files.some((f) => f.kind === 'scattering')
  const angles = c.truncation?.angles_deg
  return (
    <section class="record-params" aria-label="Record parameters">
      <label class="record-param">
        <span>Composition and humidity of</span>
        <select value={c.sample} onChange={(e) => setParameter((x) => (x.sample = (e.target as HTMLSelectElement).value), 'sample')} data-testid="record-sample">
          {!s.study.samples.some((x) => x.name === c.sample) && <option value={c.sample}>{c.sample} (not in the study)</option>}
          {s.study.samples.map((x) => (
            <option key={x.name} value={x.name}>
              {x.name}
            </option>
          ))}
        </select>
      </label>
      <ParamField label="Wavelength" unit="nm" value={c.wavelength_nm} testId="record-wavelength" read={(v) => (v >= 200 && v <= 40000 ? null : 'give 200 to 40000 nm')} commit={(v) => setParameter((x) => (x.wavelength_nm = v!), 'wl')} />
      <ParamField label="Particle density" unit="g cm⁻³" value={c.density_g_cm3} optional testId="record-density" hint="Converts aerodynamic diameters (needed with an aerodynamic sizer)" read={(v) => (v >= 0.1 && v <= 25 ? null : 'give 0.1 to 25 g cm⁻³')} commit={(v) => setParameter((x) => (v === undefined ? delete x.density_g_cm3 : (x.density_g_cm3 = v)), 'density')} />
      <ParamField label="Shape factor χ" unit="" value={c.shape_factor} testId="record-shape" read={(v) => (v >= 1 && v <= 5 ? null : 'give 1 (spheres) to 5')} commit={(v) => setParameter((x) => (x.shape_factor = v!), 'shape')} />
      <ParamField
        label="Time step"
        unit="min"
        value={c.step_s === undefined ? undefined : c.step_s / 60}
        optional
        testId="record-step"
        hint="Averaging step of the merge; empty: the coarsest sizer's interval"
        read={(v) => (v > 0 && v <= 44640 ? null : 'give a step above 0 min')}
        commit={(v) => setParameter((x) => (v === undefined ? delete x.step_s : (x.step_s = v * 60)), 'step')}
      />
      {hasScattering && (
        <label class="record-param" title="Multiplies the measured scattering by C = σ true / σ seen from each row's own phase function (after Anderson & Ogren 1998), as motebench series --truncation does">
          <input
            type="checkbox"
            checked={!!angles}
            data-testid="record-truncation"
            onChange={(e) => setParameter((x) => ((e.target as HTMLInputElement).checked ? (x.truncation = { angles_deg: [...DEFAULT_NEPHELOMETER_ANGLES] as [number, number] }) : delete x.truncation), 'truncation')}
          />
          <span>Correct the measured scattering for truncation</span>
        </label>
      )}
      {hasScattering && angles && (
        <>
          <ParamField label="Nephelometer sees from" unit="°" value={angles[0]} testId="record-neph-low" read={(v) => (v >= 0 && v < angles[1] && v <= 90 ? null : `give 0 to ${Math.min(90, angles[1])}°`)} commit={(v) => setParameter((x) => x.truncation && (x.truncation.angles_deg = [v!, x.truncation.angles_deg[1]]), 'neph-low')} />
          <ParamField label="to" unit="°" value={angles[1]} testId="record-neph-high" read={(v) => (v > 90 && v <= 180 ? null : 'give above 90 to 180°')} commit={(v) => setParameter((x) => x.truncation && (x.truncation.angles_deg = [x.truncation.angles_deg[0], v!]), 'neph-high')} />
        </>
      )}
      {hasOptical && (
        <>
          <ParamField label="Counter index n" unit="" value={c.counter?.n} testId="record-counter-n" read={(v) => (v > 1 && v <= 3 ? null : 'give n from 1 to 3')} commit={(v) => setParameter((x) => (x.counter = { n: v!, k: x.counter?.k ?? 0, wavelength_nm: x.counter?.wavelength_nm ?? 780, angles_deg: x.counter?.angles_deg ?? [35, 120] }), 'cn')} />
          <ParamField label="k" unit="" value={c.counter?.k} testId="record-counter-k" read={(v) => (v >= 0 && v <= 3 ? null : 'give k from 0 to 3')} commit={(v) => setParameter((x) => x.counter && (x.counter.k = v!), 'ck')} />
          <ParamField label="Laser" unit="nm" value={c.counter?.wavelength_nm} testId="record-counter-wl" read={(v) => (v >= 200 && v <= 2000 ? null : 'give 200 to 2000 nm')} commit={(v) => setParameter((x) => x.counter && (x.counter.wavelength_nm = v!), 'cwl')} />
        </>
      )}
    </section>
  )
}

const typed = (t: string): number => {
  const r = readDateTime(t.trim(), undefined, 'ymd', undefined)
  return r ? r.ms : NaN
}
const isoOf = (ms: number) => new Date(Math.round(ms)).toISOString().slice(0, 19) + 'Z'

function Stretch() {
  const s = useSession()
  const [from, setFrom] = useState<string | null>(null)
  const [to, setTo] = useState<string | null>(null)
  const [why, setWhy] = useState<string | null>(null)
  const m = s.mark
  const fromText = from ?? (m ? isoOf(m[0]) : '')
  const toText = to ?? (m ? isoOf(m[1]) : '')
  const apply = () => {
    const a = typed(fromText)
    const b = typed(toText)
    if (!Number.isFinite(a) || !Number.isFinite(b)) return setWhy('Give the start and end as ISO 8601 times, e.g. 2026-06-01T10:00:00Z.')
    if (!(b >= a)) return setWhy('The end comes before the start: swap them.')
    setWhy(null)
    setFrom(null)
    setTo(null)
    setMark([a, b])
  }
  const make = () => {
    const problem = makeSample()
    setWhy(problem)
  }
  return (
    <section class="record-stretch" aria-label="Marked stretch">
      <label class="record-param">
        <span>From</span>
        <input type="text" value={fromText} onInput={(e) => setFrom((e.target as HTMLInputElement).value)} onKeyDown={(e) => e.key === 'Enter' && apply()} placeholder="2026-06-01T10:00:00Z" data-testid="record-from" />
      </label>
      <label class="record-param">
        <span>to</span>
        <input type="text" value={toText} onInput={(e) => setTo((e.target as HTMLInputElement).value)} onKeyDown={(e) => e.key === 'Enter' && apply()} placeholder="2026-06-01T12:00:00Z" data-testid="record-to" />
      </label>
      <button type="button" class="small" onClick={apply} data-testid="record-mark">
        Mark
      </button>
      <button type="button" class="small" disabled={!m} onClick={() => m && zoomControls.zoom(m[0], m[1])}>
        Zoom to mark
      </button>
      <button type="button" class="primary" disabled={!m} onClick={make} data-testid="record-make-sample" title="The mean distribution over the marked stretch, with its spread, as a new sample">
        Make a sample
      </button>
      {why && (
        <p class="field-problem" role="alert" data-testid="record-stretch-problem">
          {why}
        </p>
      )}
    </section>
  )
}

function Exports() {
  const s = useSession()
  const name = fileStem(store().get().study.name)
  const csv = (visible: boolean) => {
    const r = s.build?.record
    if (!r) return
    const v = visible ? s.visible : null
    void host().exportFile({ suggestedName: `${name}-record${v ? '-visible' : ''}.csv`, kind: 'csv', text: recordCsv(r, v?.[0], v?.[1]) })
  }
  const png = () => {
    const url = recordPng()
    if (url) void host().exportFile({ suggestedName: `${name}-record.png`, kind: 'png', base64: url.slice(url.indexOf(',') + 1) })
  }
  return (
    <div class="record-row record-exports">
      <button type="button" class="small ghost" onClick={() => zoomControls.step('-')} aria-label="Zoom out">
        −
      </button>
      <button type="button" class="small ghost" onClick={() => zoomControls.step('+')} aria-label="Zoom in">
        +
      </button>
      <button type="button" class="small ghost" onClick={() => zoomControls.step('ArrowLeft')} aria-label="Earlier">
        ◀
      </button>
      <button type="button" class="small ghost" onClick={() => zoomControls.step('ArrowRight')} aria-label="Later">
        ▶
      </button>
      <button type="button" class="small ghost" onClick={() => zoomControls.whole()}>
        Whole record
      </button>
      <span class="spacer" />
      <button type="button" class="small" onClick={() => csv(true)} disabled={!s.visible} data-testid="record-csv-visible">
        CSV of the visible range
      </button>
      <button type="button" class="small" onClick={() => csv(false)} data-testid="record-csv">
        CSV of the whole record
      </button>
      <button type="button" class="small" onClick={png} data-testid="record-png">
        Charts PNG
      </button>
    </div>
  )
}

export function RecordView() {
  const app = useApp()
  const s = useSession()
  const c = app.study.campaign
  useEffect(() => {
    if (c) refresh()
    else prepareRecordWorker() // its script loads while the user chooses the files
  }, [])
  const r = s.build?.record
  return (
    <div class="record-view" data-view="record">
      <p class="muted">
        A campaign: the station's instrument files over time, merged and computed row by row with the composition and humidity of one sample, the measured coefficients beside the computed ones. Drag
        across the charts (or type a start and end) to mark a stretch and make it a sample.
      </p>
      <Files c={c} />
      {c && <Parameters c={c} />}
      {s.running && (
        <div class="record-row" role="status">
          <progress max={1} value={s.share} aria-label="Record computed" data-testid="record-progress" />
          <span>{Math.round(s.share * 100)} %</span>
          <button type="button" class="small" onClick={stopRecord} data-testid="record-stop">
            Stop
          </button>
        </div>
      )}
      {s.failure && (
        <p class="record-file-problem" role="alert" data-testid="record-problem">
          {s.failure}{' '}
          {!s.running && (
            <button type="button" class="small" onClick={() => refresh(true)}>
              Compute again
            </button>
          )}
        </p>
      )}
      {r && (
        <>
          <p class="muted" data-testid="record-summary">
            {r.times.length} rows from {r.timeText[0]} to {r.timeText[r.timeText.length - 1]}, {r.bins} bins, {r.times.length - countAbsent(r.present)} with a distribution
            {r.gaps.size > 0 ? `, ${r.gaps.size} gap rows (${[...new Set(r.gaps.values())].join('; ')})` : ''}; computed at the composition and humidity of “{r.sample.name}” ({r.sample.rh_percent} %){r.rhFile ? <>; {r.rhFile} records the humidity it measured at (a sample made from a stretch takes its mean there)</> : <> (no file records a humidity)</>}; computed in {(s.ms / 1000).toFixed(1)} s.
          </p>
          <Stretch />
          <Exports />
          <RecordCharts record={r} theme={app.theme} />
        </>
      )}
    </div>
  )
}

function countAbsent(p: Uint8Array): number {
  let n = 0
  for (let i = 0; i < p.length; i++) if (!p[i]) n++
  return n
}
