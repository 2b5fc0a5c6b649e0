// The recovery copy of unsaved work: written shortly after each edit (desktop: a file per window, see
// src-main/recovery-store.ts; browser: localStorage, see host/browser.ts), removed once the work is saved or
// discarded, and offered again at the next start (restore or discard).
import { parseStudy, serializeStudy, type Study } from '../src-core/index.ts'
import type { RecoveryCopy } from '../src-main/host-api.ts'
import { host } from './host/index.ts'
import { load } from './state/actions.ts'
import { store } from './state/store.ts'

/** A copy is written this long after the last edit (ms), and at the latest when the page goes away. */
export const RECOVERY_DELAY_MS = 1000

/** A recovery copy found at start-up, read, waiting for the user's answer. */
export interface RecoveryOffer {
  copy: RecoveryCopy
  study: Study
}

let offer: RecoveryOffer | null = null
/** A copy of this window's work is kept (written, or restored and not yet saved). */
let copyKept = false
const listeners = new Set<() => void>()

export const recoveryOffer = (): RecoveryOffer | null => offer
export function onRecoveryOffer(l: () => void): () => void {
  listeners.add(l)
  return () => listeners.delete(l)
}
function setOffer(o: RecoveryOffer | null): void {
  offer = o
  for (const l of [...listeners]) l()
}

/** Holds a copy found at start-up for the user to restore or discard; an unreadable one is dropped. */
export function offerRecovery(copy: RecoveryCopy): void {
  const r = parseStudy(copy.text, 'recovery copy')
  if (r.ok) setOffer({ copy, study: r.study })
  else void host().keepRecovery(null)
}

/** Replaces the study on screen with the recovered one, unsaved, with its file name if it had one. */
export function restoreRecovery(): void {
  if (!offer) return
  const { copy, study } = offer
  setOffer(null)
  copyKept = true
  load(study, copy.path ? { name: copy.path.split(/[\\/]/).pop() ?? copy.name, path: copy.path } : null, true)
}

/** Deletes the copy: the work in it is given up. */
export function discardRecovery(): void {
  if (!offer) return
  setOffer(null)
  void host().keepRecovery(null)
}

/**
 * Keeps the recovery copy in step with the study: written RECOVERY_DELAY_MS after the last change while there
 * are unsaved changes (and at once when the page is hidden or closed), removed when the study is saved or replaced
 * by another without unsaved changes. Nothing is written while a found copy waits for the user's answer, so that
 * the demo study shown meanwhile never overwrites it.
 */
export function keepRecoveryCopy(): void {
  let timer: ReturnType<typeof setTimeout> | undefined
  /** The study last written. */
  let written: Study | null = null
  const write = () => {
    clearTimeout(timer)
    timer = undefined
    const s = store().get()
    if (offer || !s.dirty || written === s.study) return
    written = s.study
    copyKept = true
    void host().keepRecovery({ text: serializeStudy(s.study), savedAt: new Date().toISOString(), name: s.study.name, path: s.file?.path })
  }
  let seen: Study | null = store().get().study
  let wasDirty = store().get().dirty
  store().subscribe(() => {
    const s = store().get()
    if (s.study === seen && s.dirty === wasDirty) return
    seen = s.study
    wasDirty = s.dirty
    if (offer) return
    if (s.dirty) {
      clearTimeout(timer)
      timer = setTimeout(write, RECOVERY_DELAY_MS)
    } else {
      // saved, or replaced by a study without changes (open, new, demo): the copy has nothing left to keep
      clearTimeout(timer)
      timer = undefined
      written = null
      if (copyKept) void host().keepRecovery(null)
      copyKept = false
    }
  })
  const flush = () => timer !== undefined && write()
  window.addEventListener('pagehide', flush)
  document.addEventListener('visibilitychange', () => document.visibilityState === 'hidden' && flush())
}
