// Importing a sizer export: the choices the file leaves open (or that override it), a preview of what will be
// read, which rows (one, or the mean over a time range) and where the bins go. All reading is src-core's.
import { useMemo, useState } from 'preact/hooks'
import {
  averageRecords,
  BIN_QUANTITIES,
  DATE_ORDER_NAMES,
  InputError,
  parseSizerText,
  readDateTime,
  recordedHumidity,
  SizerChoiceNeeded,
  sizerRecordToBins,
  type BinQuantityName,
  type DateOrder,
  type SampleHumidity,
  type SizerOptions,
  type SizerTable
} from '../../src-core/index.ts'
import type { PendingSizer } from '../commands.ts'
import { diameter } from '../format.ts'
import { blankSample, edit, editSample } from '../state/actions.ts'
import { newId, store } from '../state/store.ts'
import { Dialog } from './Dialog.tsx'

/** Rows offered one by one in the row list (a long series is averaged, or a row picked by its time range). */
const MAX_LISTED_ROWS = 2000

interface Choices {
  unit: '' | 'nm' | 'um'
  quantity: '' | BinQuantityName
  order: '' | DateOrder
  year: string
  negatives: 'drop' | 'zero'
}

type Read = { table: SizerTable; error?: undefined } | { table?: undefined; error: InputError }

function readWith(p: PendingSizer, c: Choices): Read {
  const o: SizerOptions = { fileName: p.name, negatives: c.negatives }
  if (c.unit) o.diameterUnit = c.unit
  if (c.quantity) o.quantity = c.quantity
  if (c.order) o.dateOrder = c.order
  if (/^\d{4}$/.test(c.year.trim())) o.year = Number(c.year)
  try {
    return { table: parseSizerText(p.text, o) }
  } catch (e) {
    if (e instanceof InputError) return { error: e }
    throw e
  }
}

/** A time typed in a range field (ISO 8601, as the preview shows them): milliseconds, or NaN. */
function typedTime(text: string): number {
  const t = readDateTime(text.trim(), undefined, 'ymd', undefined)
  return t ? t.ms : NaN
}

export function SizerDialog(p: { pending: PendingSizer; onClose: () => void }) {
  const [c, setC] = useState<Choices>({ unit: '', quantity: '', order: '', year: '', negatives: 'drop' })
  const set = (patch: Partial<Choices>) => setC({ ...c, ...patch })
  const plain = !c.unit && !c.quantity && !c.order && !c.year && c.negatives === 'drop'
  const read = useMemo<Read>(() => (plain && p.pending.table ? { table: p.pending.table } : plain && p.pending.needs ? { error: p.pending.needs } : readWith(p.pending, c)), [c])
  const t = read.table
  const needs = read.error instanceof SizerChoiceNeeded ? read.error.choice : undefined
  const timed = !!t && t.records.length > 0 && t.records.every((r) => Number.isFinite(r.timeMs))
  const many = !!t && t.records.length > 1

  const [take, setTake] = useState<'mean' | 'one'>('mean')
  const [record, setRecord] = useState(0)
  const [from, setFrom] = useState('')
  const [to, setTo] = useState('')
  const [target, setTarget] = useState<'new' | 'replace'>('new')

  // The rows taken: all by default; a time range (or row numbers when the times are labels) when given.
  const first = t?.records[0]
  const last = t?.records[t.records.length - 1]
  const fromText = from || (timed ? (first?.time ?? '') : '1')
  const toText = to || (timed ? (last?.time ?? '') : String(t?.records.length ?? 1))
  let rangeError = ''
  let mean: ReturnType<typeof averageRecords> | undefined
  if (t && t.records.length > 0 && (take === 'mean' || !many)) {
    const lo = timed ? typedTime(fromText) : Number(fromText) - 1
    const hi = timed ? typedTime(toText) : Number(toText) - 1
    if (!Number.isFinite(lo) || !Number.isFinite(hi)) rangeError = timed ? 'Write the times as in the preview, e.g. 2024-03-14T23:00:00.' : 'Give row numbers.'
    else if (hi < lo) rangeError = 'The end comes before the start.'
    else {
      try {
        mean = timed ? averageRecords(t.records, { fromMs: lo, toMs: hi }) : averageRecords(t.records, { fromIndex: lo, toIndex: hi })
      } catch (e) {
        rangeError = e instanceof InputError ? 'No row of the file lies in this range.' : String(e)
      }
    }
  }
  // The humidity the sample takes: where the file records one (a humidity column), the mean over the rows taken
  // (the station record's rule, recordedHumidity), unless the user keeps the selected sample's own.
  const [useFileRh, setUseFileRh] = useState(true)
  const selected = store().get()
  const own = selected.study.samples[selected.ids.indexOf(selected.selected)]?.rh_percent ?? blankSample('').rh_percent
  let fileRh: SampleHumidity | undefined
  if (t?.humidityColumn) {
    if (!many || take === 'one') {
      const v = t.records[many ? record : 0]?.rh ?? NaN
      fileRh = v === v ? recordedHumidity(p.pending.name, v, 1, own) : recordedHumidity(p.pending.name, 0, 0, own)
    } else if (mean) fileRh = recordedHumidity(p.pending.name, mean.rhSum, mean.rhRows, own)
  }
  const takesRh = fileRh?.from === 'files' && useFileRh ? fileRh : undefined

  const blocked = !t ? 'The file cannot be read with these choices.' : t.records.length === 0 ? 'No row of the file can be read.' : t.layout !== 'time-rows' && t.rejected.length ? 'The distribution has bad rows (listed above); fix the file, or choose to set negative values to 0 if those are the problem.' : rangeError

  const apply = () => {
    if (!t || blocked) return
    const stem = p.pending.name.replace(/\.[^.]+$/, '')
    let bins
    let label: string
    if (!many || take === 'one') {
      const rec = t.records[many ? record : 0]
      bins = sizerRecordToBins(t, rec, p.pending.name)
      label = rec.time
    } else {
      const m = mean!
      const span = m.count === 1 ? m.firstTime : `${m.firstTime} to ${m.lastTime}`
      bins = { ...sizerRecordToBins(t, { ...t.records[0], values: m.values, time: '' }), source: `${p.pending.name}, mean of ${m.count} row${m.count === 1 ? '' : 's'}${span ? `, ${span}` : ''}`, rows_averaged: m.count }
      label = m.count === 1 ? m.firstTime : `mean ${span}`
    }
    const s = store().get()
    const rhNote = takesRh ? ` Humidity ${takesRh.percent} %: the mean relative humidity recorded in the file over ${takesRh.rows} of the rows taken.` : ''
    if (target === 'replace') {
      editSample(s.selected, (x) => {
        x.size = { kind: 'bins', bins }
        if (takesRh) {
          x.rh_percent = takesRh.percent
          x.notes = `${x.notes ? `${x.notes}\n` : ''}Measured bins from ${bins.source ?? p.pending.name}.${rhNote}`
        }
      })
    } else {
      const i = s.ids.indexOf(s.selected)
      const id = newId()
      edit((study, ids) => {
        const base = study.samples[i] ?? blankSample('')
        const name = `${stem}${label ? ` ${label}` : ''}`
        study.samples.push({ ...structuredClone(base), name, notes: `Measured bins from ${bins.source ?? p.pending.name}.${rhNote}`, size: { kind: 'bins', bins }, ...(takesRh ? { rh_percent: takesRh.percent } : {}) })
        ids.push(id)
      })
      store().set({ selected: id })
    }
    p.onClose()
  }

  const unitName = (u: 'nm' | 'um') => (u === 'um' ? 'µm' : 'nm')
  const scale = t?.diameterUnit === 'nm' ? 1e-3 : 1
  const nBins = t ? t.diameters.length - (t.edges ? 1 : 0) : 0
  return (
    <Dialog title={`Import “${p.pending.name}”`} name="sizer" onClose={p.onClose} wide>
      <fieldset class="sizer-choices">
        <legend>How to read it</legend>
        <label class={`field${needs === 'diameterUnit' && !c.unit ? ' is-bad' : ''}`}>
          <span>Diameter unit</span>
          <select data-testid="sizer-unit" value={c.unit} onChange={(e) => set({ unit: (e.target as HTMLSelectElement).value as Choices['unit'] })}>
            <option value="">{needs === 'diameterUnit' && !c.unit ? 'choose…' : `as the file says${t ? ` (${unitName(t.diameterUnit)})` : ''}`}</option>
            <option value="nm">nm</option>
            <option value="um">µm</option>
          </select>
        </label>
        <label class={`field${needs === 'quantity' && !c.quantity ? ' is-bad' : ''}`}>
          <span>Values are</span>
          <select data-testid="sizer-quantity" value={c.quantity} onChange={(e) => set({ quantity: (e.target as HTMLSelectElement).value as Choices['quantity'] })}>
            <option value="">{needs === 'quantity' && !c.quantity ? 'choose…' : `as the file says${t ? ` (${t.quantity})` : ''}`}</option>
            {BIN_QUANTITIES.map((q) => (
              <option value={q} key={q}>
                {q}
              </option>
            ))}
          </select>
        </label>
        {(needs === 'dateOrder' || c.order || t?.dateOrder) && (
          <label class={`field${needs === 'dateOrder' && !c.order ? ' is-bad' : ''}`}>
            <span>Dates</span>
            <select data-testid="sizer-date-order" value={c.order} onChange={(e) => set({ order: (e.target as HTMLSelectElement).value as Choices['order'] })}>
              <option value="">{needs === 'dateOrder' && !c.order ? 'choose…' : `as detected${t?.dateOrder ? ` (${DATE_ORDER_NAMES[t.dateOrder]})` : ''}`}</option>
              {(['dmy', 'mdy', 'ymd'] as const).map((o) => (
                <option value={o} key={o}>
                  {DATE_ORDER_NAMES[o]}
                </option>
              ))}
            </select>
          </label>
        )}
        {(needs === 'year' || c.year || /day of year/.test(t?.timeFormat ?? '')) && (
          <label class={`field${needs === 'year' && !/^\d{4}$/.test(c.year) ? ' is-bad' : ''}`}>
            <span>Year of the day-of-year times</span>
            <input data-testid="sizer-year" inputMode="numeric" value={c.year} placeholder="e.g. 2024" onInput={(e) => set({ year: (e.target as HTMLInputElement).value })} />
          </label>
        )}
        <div class="field">
          <span>Negative values</span>
          <label class="radio">
            <input type="radio" name="sizer-negatives" checked={c.negatives === 'drop'} onChange={() => set({ negatives: 'drop' })} /> leave the row out
          </label>
          <label class="radio">
            <input type="radio" name="sizer-negatives" data-testid="sizer-negatives-zero" checked={c.negatives === 'zero'} onChange={() => set({ negatives: 'zero' })} /> set them to 0
          </label>
        </div>
      </fieldset>

      {read.error && (
        <p class="sizer-problem" role="alert" data-testid="sizer-problem">
          {read.error.message}
        </p>
      )}
      {t && (
        <dl class="sizer-preview" data-testid="sizer-preview">
          <dt>Bins</dt>
          <dd data-testid="preview-bins">
            {nBins} bins, {diameter(t.diameters[0] * scale)} – {diameter(t.diameters[t.diameters.length - 1] * scale)} ({t.edges ? 'edges' : 'midpoints'}), values as {t.quantity}
          </dd>
          <dt>Rows</dt>
          <dd data-testid="preview-rows">
            {t.records.length} read{t.rowsLeftOut ? `, ${t.rowsLeftOut} left out` : ''}
            {t.negativesZeroed.cells ? `; negatives set to 0: ${t.negativesZeroed.cells} cell${t.negativesZeroed.cells === 1 ? '' : 's'} in ${t.negativesZeroed.rows} row${t.negativesZeroed.rows === 1 ? '' : 's'}` : ''}
          </dd>
          {first && (first.time || t.timeFormat) && (
            <>
              <dt>Time</dt>
              <dd data-testid="preview-time">
                {first.time}
                {last && last.time !== first.time ? ` to ${last.time}` : ''}
                {t.timeFormat ? ` (${t.timeFormat})` : ''}
              </dd>
            </>
          )}
          <dt>Ignored</dt>
          <dd data-testid="preview-ignored">{t.ignoredColumns.length ? t.ignoredColumns.map((x) => `“${x.name}” (column ${x.column})`).join(', ') : 'nothing'}</dd>
          {(t.notes.length > 0 || t.unitsLine > 0) && (
            <>
              <dt>Notes</dt>
              <dd data-testid="preview-notes">{[...(t.unitsLine ? [`units row on line ${t.unitsLine}`] : []), ...t.notes].join('; ')}</dd>
            </>
          )}
          {t.rejected.length > 0 && (
            <>
              <dt>Left out</dt>
              <dd>
                <ul class="sizer-left-out" data-testid="preview-left-out">
                  {t.rejected.slice(0, 20).map((r, k) => (
                    <li key={k}>
                      line {r.line}
                      {r.column ? `, column ${r.column}` : ''}: {r.reason}
                    </li>
                  ))}
                  {t.rejected.length > 20 && <li>… and {t.rejected.length - 20} more</li>}
                </ul>
              </dd>
            </>
          )}
        </dl>
      )}

      {t && many && (
        <fieldset>
          <legend>Rows to take</legend>
          <label class="radio">
            <input type="radio" name="sizer-take" checked={take === 'mean'} onChange={() => setTake('mean')} data-testid="sizer-take-mean" /> the mean of the rows {timed ? 'from' : 'numbered'}
          </label>
          <div class="sizer-range">
            <input data-testid="sizer-from" aria-label="start" value={fromText} disabled={take !== 'mean'} onInput={(e) => setFrom((e.target as HTMLInputElement).value)} />
            <span>to</span>
            <input data-testid="sizer-to" aria-label="end" value={toText} disabled={take !== 'mean'} onInput={(e) => setTo((e.target as HTMLInputElement).value)} />
            {take === 'mean' && (
              <span data-testid="sizer-range-count" class={rangeError ? 'field-error' : ''}>
                {rangeError || `${mean?.count} row${mean?.count === 1 ? '' : 's'}`}
              </span>
            )}
          </div>
          <label class="radio">
            <input type="radio" name="sizer-take" checked={take === 'one'} onChange={() => setTake('one')} data-testid="sizer-take-one" /> one row:
            <select value={record} disabled={take !== 'one'} onChange={(e) => setRecord(Number((e.target as HTMLSelectElement).value))}>
              {t.records.slice(0, MAX_LISTED_ROWS).map((r, k) => (
                <option value={k} key={k}>
                  {r.time || `row ${k + 1}`} (line {r.line})
                </option>
              ))}
            </select>
          </label>
        </fieldset>
      )}
      {t?.humidityColumn && fileRh && (
        <fieldset data-testid="sizer-humidity">
          <legend>Humidity</legend>
          {fileRh.from === 'files' ? (
            <label class="sizer-rh">
              <input type="checkbox" checked={useFileRh} onChange={(e) => setUseFileRh((e.target as HTMLInputElement).checked)} data-testid="sizer-use-rh" /> take the humidity the file
              records in “{t.humidityColumn.name}” (column {t.humidityColumn.column}): <strong data-testid="sizer-rh">{fileRh.percent} %</strong>, the mean over{' '}
              {fileRh.rows} of the rows taken; otherwise the sample keeps {own} %
            </label>
          ) : (
            <p data-testid="sizer-rh-none">
              The file has a humidity column (“{t.humidityColumn.name}”), but {fileRh.why}: the sample keeps {own} %.
            </p>
          )}
          {t.humidityRejected.length > 0 && (
            <ul class="sizer-left-out" data-testid="sizer-rh-left-out">
              {t.humidityRejected.slice(0, 5).map((r, k) => (
                <li key={k}>
                  line {r.line}, column {r.column}: {r.reason}
                </li>
              ))}
              {t.humidityRejected.length > 5 && <li>… and {t.humidityRejected.length - 5} more</li>}
            </ul>
          )}
        </fieldset>
      )}
      <fieldset>
        <legend>Put it</legend>
        <label class="radio">
          <input type="radio" name="sizer-target" checked={target === 'new'} onChange={() => setTarget('new')} /> in a new sample (composition and layer copied from the selected one)
        </label>
        <label class="radio">
          <input type="radio" name="sizer-target" checked={target === 'replace'} onChange={() => setTarget('replace')} /> as the size distribution of the selected sample
        </label>
      </fieldset>
      <div class="dialog-buttons">
        {blocked && t && <span class="field-error">{blocked}</span>}
        <button type="button" onClick={p.onClose}>
          Cancel
        </button>
        <button type="button" class="primary" onClick={apply} data-testid="sizer-apply" disabled={!!blocked}>
          Import
        </button>
      </div>
    </Dialog>
  )
}
