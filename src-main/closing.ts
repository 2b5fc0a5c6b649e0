// Closing a window: it closes at once unless its study has unsaved changes; then the user chooses.
import type { MessageBoxSyncOptions } from 'electron'

export interface ClosingState {
  /** The study has changes that are not saved. */
  dirty: boolean
  /** The user already chose to close (after saving, or without saving): do not ask again. */
  closing: boolean
}

/** What a close request does: close now, or stop and ask. */
export function onCloseRequest(state: ClosingState): 'close' | 'ask' {
  return state.dirty && !state.closing ? 'ask' : 'close'
}

export type CloseAnswer = 'save-then-close' | 'close-without-saving' | 'stay'

/** The question's buttons, in the order shown. */
const CLOSE_BUTTONS: readonly { label: string; answer: CloseAnswer }[] = [
  { label: 'Save…', answer: 'save-then-close' },
  { label: 'Close without saving', answer: 'close-without-saving' },
  { label: 'Cancel', answer: 'stay' }
]

const indexOf = (answer: CloseAnswer) => CLOSE_BUTTONS.findIndex((b) => b.answer === answer)

/** The question shown before a window with unsaved changes closes; Escape (or closing the box) keeps the window. */
export function unsavedChangesQuestion(studyTitle: string): MessageBoxSyncOptions {
  return {
    type: 'question',
    buttons: CLOSE_BUTTONS.map((b) => b.label),
    defaultId: indexOf('save-then-close'),
    cancelId: indexOf('stay'),
    message: `Save the changes to “${studyTitle}” before closing?`,
    detail: 'Unsaved changes are lost when the window closes without saving.'
  }
}

/** The answer behind the button the user pressed; anything unexpected keeps the window open. */
export function closeAnswer(buttonIndex: number): CloseAnswer {
  return CLOSE_BUTTONS[buttonIndex]?.answer ?? 'stay'
}
