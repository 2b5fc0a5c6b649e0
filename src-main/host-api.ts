/**
 * The host API: what the renderer may ask of the platform (files, dialogs, printing, recovery), shared by the
 * preload, the main process and the renderer. Main validates every message against these zod schemas; the
 * renderer sees only the `Host` interface (desktop: `window.motebenchHost`, browser: src-renderer/host/browser.ts).
 *
 * This file imports nothing (no Electron, no Node, no zod), so the sandboxed preload and the renderer can use it;
 * the schemas main checks messages against are in ipc-schemas.ts.
 */

/** Menu commands main sends to the renderer (the renderer's buttons and shortcuts use the same names). */
export const MENU_COMMANDS = [
  'new',
  'open',
  'save',
  'save-as',
  'import-sizer',
  'add-instrument-files',
  'export-csv',
  'export-json',
  'export-report',
  'undo',
  'redo',
  'cautions',
  'catalogue',
  'save-and-close'
] as const
export type MenuCommand = (typeof MENU_COMMANDS)[number]

/** A text file the user chose (path only on the desktop). */
export interface OpenedFile {
  name: string
  path?: string
  text: string
  /** Instrument files read by the desktop: the whole text's fingerprint (src-core/field/fingerprint.ts), made by the host. */
  fingerprint?: string
}

/**
 * An instrument file of a campaign as the host gives it: its text (desktop, which reads it in the main process),
 * or the file itself (web page: not read on the page; the record's worker reads its bytes).
 */
export type InstrumentFile = OpenedFile | { name: string; path?: string; blob: Blob }

/** A recovery copy found at start-up. */
export interface RecoveryCopy {
  text: string
  /** ISO time of the copy. */
  savedAt: string
  /** Name of the study when it was copied. */
  name: string
  /** Where it was saved last, if ever. */
  path?: string
}

/** What a window starts with: a file it was opened for, a recovery copy to offer, or nothing (the demo). */
export interface StartUp {
  file?: OpenedFile
  recovery?: RecoveryCopy
  /** The window is for a new, empty study (File ▸ New in a busy window). */
  blank?: boolean
}

export type ExportKind = 'csv' | 'json' | 'png' | 'pdf' | 'study'

/** The renderer's view of the platform. */
export interface Host {
  readonly kind: 'desktop' | 'browser'
  /** What this window opens with. */
  startUp(): Promise<StartUp>
  /**
   * Asks for a study file. Resolves to the file when this window should load it; null when cancelled or when
   * the desktop opened it in a window of its own (one window per study).
   */
  openStudy(): Promise<OpenedFile | null>
  /** Saves the study text. Without `path` (or with `saveAs`) asks where; resolves to the place, or null if cancelled. */
  saveStudy(req: { text: string; path?: string; suggestedName: string; saveAs: boolean }): Promise<{ name: string; path?: string } | null>
  /** Asks for a sizer export (CSV/TSV/text). */
  openSizerFile(): Promise<OpenedFile | null>
  /** Asks for one or more instrument files of a campaign (sizers, nephelometer, absorption photometer). */
  openInstrumentFiles(): Promise<InstrumentFile[] | null>
  /**
   * Reads an instrument file a study refers to, by its absolute path (desktop); `missing` says why it could not
   * be read (moved, renamed, or a web page, which cannot open a file by its path).
   */
  readInstrumentFile(path: string): Promise<OpenedFile | { missing: string }>
  /** Writes an export (text, or bytes as base64) where the user says; resolves to false if cancelled. */
  exportFile(req: { suggestedName: string; kind: ExportKind; text?: string; base64?: string }): Promise<boolean>
  /** Prints the page that is showing (the report): desktop writes a PDF, the browser opens its print dialog. */
  printReport(req: { suggestedName: string }): Promise<boolean>
  /** Keeps a recovery copy (null: none needed, e.g. after saving). */
  keepRecovery(copy: RecoveryCopy | null): Promise<void>
  /** Tells the host the window title and whether there are unsaved changes (asked before closing). */
  setState(state: { title: string; dirty: boolean; pristine: boolean }): void
  /** Menu commands (desktop menu; the browser has none). Returns a function that stops listening. */
  onCommand(listener: (command: MenuCommand) => void): () => void
  /** A file the desktop wants this window to load (e.g. Open Recent into a pristine window). */
  onLoad(listener: (file: OpenedFile) => void): () => void
  /** Closes this window without asking again (after "save and close"). */
  closeWindow(): void
}

// ---------------------------------------------------------------------------------------------------------------
// IPC channels.

export const CHANNELS = {
  startUp: 'motebench:start-up',
  openStudy: 'motebench:open-study',
  saveStudy: 'motebench:save-study',
  openSizer: 'motebench:open-sizer',
  openInstruments: 'motebench:open-instruments',
  readInstrument: 'motebench:read-instrument',
  exportFile: 'motebench:export-file',
  printReport: 'motebench:print-report',
  keepRecovery: 'motebench:keep-recovery',
  setState: 'motebench:set-state',
  closeWindow: 'motebench:close-window',
  command: 'motebench:command',
  load: 'motebench:load'
} as const

/** The file filters of the native dialogs, by export kind. */
export const FILE_FILTERS: Record<ExportKind, { name: string; extensions: string[] }> = {
  csv: { name: 'CSV table', extensions: ['csv'] },
  json: { name: 'JSON', extensions: ['json'] },
  png: { name: 'PNG image', extensions: ['png'] },
  pdf: { name: 'PDF document', extensions: ['pdf'] },
  study: { name: 'Motebench study', extensions: ['mote'] }
}
