// What the main process knows about each study window: its start-up, title, unsaved state, recovery file and paths.
import type { StartUp } from './host-api.ts'

export interface WindowRecord {
  readonly startUp: StartUp
  title: string
  /** The study has unsaved changes. */
  dirty: boolean
  /** The window still shows what it opened with, untouched: a study opened now may replace it. */
  pristine: boolean
  /** The user chose to close: do not ask about unsaved changes again. */
  closing: boolean
  /** Where this window's recovery copy is kept. */
  readonly recoverySlot: string
  /** Paths this window may save to without a dialog: the ones it opened, or the user chose in a save dialog. */
  readonly granted: Set<string>
}

/** The windows by the id of their web contents. */
export class WindowRegistry {
  private readonly records = new Map<number, WindowRecord>()

  add(id: number, startUp: StartUp, recoverySlot: string): WindowRecord {
    const record: WindowRecord = {
      startUp,
      title: startUp.file?.name ?? 'Motebench',
      dirty: false,
      pristine: !startUp.file,
      closing: false,
      recoverySlot,
      granted: new Set(startUp.file?.path ? [startUp.file.path] : [])
    }
    this.records.set(id, record)
    return record
  }

  get(id: number): WindowRecord | undefined {
    return this.records.get(id)
  }

  /** The window's record; a message from anything else (a closed window, a frame the app did not make) is refused. */
  require(id: number): WindowRecord {
    const record = this.records.get(id)
    if (!record) throw new Error(`A message came from web contents ${id}, which is not a study window (it was closed, or the app did not open it); it was ignored.`)
    return record
  }

  remove(id: number): WindowRecord | undefined {
    const record = this.records.get(id)
    this.records.delete(id)
    return record
  }

  get size(): number {
    return this.records.size
  }

  /** What the window last reported about its study. */
  report(id: number, state: { title: string; dirty: boolean; pristine: boolean }): void {
    const record = this.require(id)
    record.title = state.title
    record.dirty = state.dirty
    record.pristine = state.pristine
  }

  /** The window holds this file now (opened, or saved there): it may save to it again without asking. */
  grant(id: number, path: string): void {
    const record = this.require(id)
    record.granted.add(path)
    record.pristine = false
  }

  /** Where to save without a dialog, or null to ask: never a path the window was not given, whatever it sends. */
  savePathWithoutAsking(id: number, request: { path?: string; saveAs: boolean }): string | null {
    const record = this.require(id)
    if (request.saveAs || !request.path || !record.granted.has(request.path)) return null
    return request.path
  }

  /** Whether a study opened from this window loads into it (it holds nothing yet) or gets a window of its own. */
  opensInto(id: number | undefined): 'this-window' | 'new-window' {
    const record = id === undefined ? undefined : this.records.get(id)
    return record?.pristine ? 'this-window' : 'new-window'
  }
}
