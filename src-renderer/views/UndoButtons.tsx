// Undo and redo as buttons (the same history as Ctrl+Z / Ctrl+Shift+Z and the desktop's Edit menu).
import { redo, undo } from '../state/actions.ts'
import { useApp } from '../state/store.ts'

export function UndoButtons() {
  const s = useApp()
  return (
    <span class="history-buttons" role="group" aria-label="Undo history">
      <button type="button" class="ghost" onClick={undo} disabled={!s.past.length} title="Undo the last change (Ctrl+Z)" data-testid="undo">
        ↶ Undo
      </button>
      <button type="button" class="ghost" onClick={redo} disabled={!s.future.length} title="Redo the change undone last (Ctrl+Shift+Z or Ctrl+Y)" data-testid="redo">
        ↷ Redo
      </button>
    </span>
  )
}
