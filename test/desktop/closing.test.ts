// Closing a window with unsaved changes: ask, and do what the answer says; anything unclear keeps the window.
import { describe, expect, it } from 'vitest'
import { closeAnswer, onCloseRequest, unsavedChangesQuestion } from '../../src-main/closing.ts'

describe('onCloseRequest', () => {
  it('closes a window with nothing unsaved', () => {
    expect(onCloseRequest({ dirty: false, closing: false })).toBe('close')
  })

  it('asks before closing a window with unsaved changes', () => {
    expect(onCloseRequest({ dirty: true, closing: false })).toBe('ask')
  })

  it('does not ask again once the user chose to close', () => {
    expect(onCloseRequest({ dirty: true, closing: true })).toBe('close')
  })
})

describe('the unsaved-changes question', () => {
  const q = unsavedChangesQuestion('Valley winter')
  const answers = q.buttons!.map((_, i) => closeAnswer(i))

  it('names the study', () => {
    expect(q.message).toContain('Valley winter')
  })

  it('offers save, discard and cancel, one button each', () => {
    expect([...answers].sort()).toEqual(['close-without-saving', 'save-then-close', 'stay'])
  })

  it('saves on Enter and keeps the window on Escape', () => {
    expect(closeAnswer(q.defaultId!)).toBe('save-then-close')
    expect(closeAnswer(q.cancelId!)).toBe('stay')
  })

  it('labels each button with what it does', () => {
    const label = (answer: string) => q.buttons![answers.indexOf(answer as never)]
    expect(label('save-then-close')).toMatch(/save/i)
    expect(label('close-without-saving')).toMatch(/without saving/i)
    expect(label('stay')).toMatch(/cancel/i)
  })

  it('keeps the window for an answer it does not know', () => {
    expect(closeAnswer(-1)).toBe('stay')
    expect(closeAnswer(99)).toBe('stay')
  })
})
