// A text input of a tool form (not part of the study document): it keeps what was typed and shows, at the field,
// why it cannot be used. The parent reads the text when it runs the tool.
import { useRef } from 'preact/hooks'
import { InputError } from '../../src-core/index.ts'

/** The reason a text cannot be read (null when it can). */
export function reasonOf<T>(read: (t: string) => T, text: string): string | null {
  try {
    read(text)
    return null
  } catch (e) {
    if (e instanceof InputError) return e.message.slice(e.where.length + 2)
    return e instanceof Error ? e.message : String(e)
  }
}

let counter = 0

export function TextField(p: {
  /** Test hook and id of the error message. */
  name: string
  label: string
  value: string
  onText: (text: string) => void
  error?: string | null
  hint?: string
  width?: string
  title?: string
  /** Hide the label visually (in tables with a header). */
  bare?: boolean
  multiline?: boolean
}) {
  const id = useRef(`t${++counter}`).current
  const bad = !!p.error
  const common = {
    id,
    value: p.value,
    spellcheck: false,
    autocomplete: 'off',
    title: p.title,
    'data-field': p.name,
    'aria-invalid': bad ? ('true' as const) : ('false' as const),
    'aria-describedby': bad ? `${id}-err` : undefined,
    style: p.width ? { width: p.width } : undefined,
    onInput: (e: Event) => p.onText((e.target as HTMLInputElement | HTMLTextAreaElement).value)
  }
  return (
    <div class={`field${bad ? ' is-bad' : ''}`}>
      <label for={id} class={p.bare ? 'sr-only' : ''}>
        {p.label}
      </label>
      <span class="field-row">
        {p.multiline ? <textarea rows={2} {...common} /> : <input type="text" inputMode="decimal" {...common} />}
        {p.hint && <span class="hint">{p.hint}</span>}
      </span>
      {bad && (
        <span class="field-error" id={`${id}-err`} role="alert" data-error-for={p.name}>
          {p.error}
        </span>
      )}
    </div>
  )
}
