// An input for one value of the document. The text is read as it is typed; a value that cannot be read, or that
// the study's schema rejects, is marked at the field with the reason (and the results are marked stale).
import { useEffect, useRef, useState } from 'preact/hooks'
import { InputError, parseNumber } from '../../src-core/index.ts'
import { setDraft } from '../state/actions.ts'
import { fieldLabel } from './fieldNames.ts'
import { store, useApp } from '../state/store.ts'

export interface FieldProps<T> {
  /** The value's JSON path in the study, e.g. samples[0].size.modes[1].gsd (matches the schema's problem paths). */
  path: string
  label: string
  value: T
  /** Reads the text; throws InputError (or Error) with the reason. */
  read: (text: string) => T
  write: (value: T) => string
  commit: (value: T) => void
  /** Short unit or hint after the field. */
  hint?: string
  /** Hide the label visually and show the reason in the table's error row instead (see ErrorRow). */
  bare?: boolean
  width?: string
  title?: string
  /** Words rather than a number (ids, names, expressions): the text keyboard on touch screens. */
  text?: boolean
}

function reason(e: unknown): string {
  if (e instanceof InputError) return e.message.slice(e.where.length + 2)
  return e instanceof Error ? e.message : String(e)
}

/** The schema's complaint about this path, if any. */
export function problemAt(path: string): string | null {
  const p = store()
    .get()
    .problems.find((q) => q.path === path)
  return p ? `${p.message}. ${p.fix}` : null
}

let idCounter = 0

export function Field<T>(p: FieldProps<T>) {
  useApp()
  const [text, setText] = useState(() => p.write(p.value))
  const [bad, setBad] = useState<string | null>(null)
  const id = useRef(`f${++idCounter}`).current
  const focused = useRef(false)

  // Follow the document when it changes from elsewhere (undo, another sample), unless the text says the same.
  useEffect(() => {
    // the text as the value writes it needs no reading (a unit read makes mathjs's units, about 0.2 s, which the
    // app's start would pay for every length field while the workers start beside it)
    if (text === p.write(p.value)) return
    try {
      if (JSON.stringify(p.read(text)) === JSON.stringify(p.value)) return
    } catch {
      /* the text is unreadable: show the document's value */
    }
    setText(p.write(p.value))
    setBad(null)
    setDraft(p.path, null)
  }, [JSON.stringify(p.value), p.path])

  useEffect(() => () => setDraft(p.path, null), [p.path])

  const onInput = (t: string) => {
    setText(t)
    try {
      const v = p.read(t)
      setBad(null)
      setDraft(p.path, null)
      if (JSON.stringify(v) !== JSON.stringify(p.value)) p.commit(v)
    } catch (e) {
      const r = reason(e)
      setBad(r)
      setDraft(p.path, r)
    }
  }

  const message = bad ?? problemAt(p.path)
  return (
    <div class={`field${message ? ' is-bad' : ''}${p.bare ? ' bare' : ''}`}>
      <label for={id} class={p.bare ? 'sr-only' : ''}>
        {p.label}
      </label>
      <span class="field-row">
        <input
          id={id}
          type="text"
          inputMode={p.text ? 'text' : 'decimal'}
          spellcheck={false}
          autocomplete="off"
          value={text}
          style={p.width ? { width: p.width } : undefined}
          title={p.title}
          data-path={p.path}
          aria-invalid={message ? 'true' : 'false'}
          aria-describedby={message && !p.bare ? `${id}-err` : undefined}
          aria-errormessage={message && p.bare ? `err-${p.path}` : undefined}
          onInput={(e) => onInput((e.target as HTMLInputElement).value)}
          onFocus={() => (focused.current = true)}
          onBlur={() => {
            focused.current = false
            if (!bad) setText(p.write(p.value))
          }}
        />
        {p.hint && <span class="hint">{p.hint}</span>}
      </span>
      {message && !p.bare && (
        <span class="field-error" id={`${id}-err`} role="alert" data-error-for={p.path}>
          {message}
        </span>
      )}
    </div>
  )
}

// ---------------------------------------------------------------------------------------------------------------
// Readers for typed numbers.

/**
 * A plain number; `what` names it in the message. Thousands separators are read where they can mean nothing else
 * ("9,000" is 9000); a comma that could be a decimal mark ("1,5") is refused with the fix (src-core parseNumber).
 */
export function readNumber(what: string): (t: string) => number {
  return (t) => parseNumber(t, what)
}

/** A value of a field in %: "85" or "85 %" is 85 (a fraction like 0.85 is not guessed to mean 85). */
export function readPercent(what: string): (t: string) => number {
  return (t) => parseNumber(t, what, { percent: 'percent' })
}

/** A fraction from 0 to 1: "0.8", or "80 %" for 0.8. */
export function readFraction(what: string): (t: string) => number {
  return (t) => parseNumber(t, what, { percent: 'fraction' })
}

/** A number or nothing (optional fields). */
export function readOptional(what: string): (t: string) => number | undefined {
  const n = readNumber(what)
  return (t) => (t.trim() === '' ? undefined : n(t))
}

/** A table row under a row of bare fields, with the reasons for those that are bad. */
export function ErrorRow(p: { paths: string[]; span: number }) {
  const s = useApp()
  const messages = p.paths.map((path) => ({ path, text: s.drafts[path] ?? problemAt(path) })).filter((m) => m.text)
  // several fields share the row: each reason says whose it is, as the column heads name them
  const whose = (path: string) => (/\]$/.test(path) ? '' : `${fieldLabel(path)}: `)
  if (!messages.length) return null
  return (
    <tr class="error-row">
      <td colSpan={p.span}>
        {messages.map((m) => (
          <span class="field-error block" role="alert" id={`err-${m.path}`} data-error-for={m.path} key={m.path}>
            {whose(m.path)}
            {m.text}
          </span>
        ))}
      </td>
    </tr>
  )
}
