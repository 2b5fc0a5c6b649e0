// Notices (a file refused, with its lines) and the toast with its undo button.
import { undo } from '../state/actions.ts'
import { store, useApp } from '../state/store.ts'

export function Notice() {
  const s = useApp()
  const n = s.notice
  if (!n) return null
  return (
    <div class={`notice ${n.kind}`} role={n.kind === 'error' ? 'alert' : 'status'} data-testid="notice">
      <strong>{n.title}</strong>
      {n.lines.length > 0 && (
        <ul>
          {n.lines.map((l, k) => (
            <li key={k}>{l}</li>
          ))}
        </ul>
      )}
      <button type="button" class="small" onClick={() => store().set({ notice: null })} aria-label="Close this message">
        Close
      </button>
    </div>
  )
}

export function Toast() {
  const s = useApp()
  if (!s.toast) return null
  return (
    <div class="toast" role="status" data-testid="toast">
      {s.toast.text}
      {s.toast.undo && (
        <button type="button" class="small primary" onClick={undo} data-testid="toast-undo">
          Undo
        </button>
      )}
      <button type="button" class="small ghost" onClick={() => store().set({ toast: null })} aria-label="Dismiss">
        ✕
      </button>
    </div>
  )
}
