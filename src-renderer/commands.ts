// What the menu, the buttons and the shortcuts do: files, exports, report, undo. The host does the platform part.
import { demoStudy, InputError, looksLikeDelimitedTable, parseSizerText, parseStudy, serializeStudy, SizerChoiceNeeded, type SizerTable } from '../src-core/index.ts'
import type { MenuCommand, OpenedFile } from '../src-main/host-api.ts'
import { cancel } from './compute/client.ts'
import { resultsCsv, resultsJson, statusLines, type ExportedResult } from './exports.ts'
import { fileStem } from './format.ts'
import { host } from './host/index.ts'
import { blankStudy, load, redo, showView, undo } from './state/actions.ts'
import { store } from './state/store.ts'
import { sampleState } from './shown.ts'
import { openCatalogue } from './views/Catalogue.tsx'
import { addFiles, rebaseForSave } from './campaign/session.ts'

const notice = (kind: 'error' | 'info', title: string, lines: string[]) => store().set({ notice: { kind, title, lines } })

/** Loads study text; problems are listed and the current study stays. */
export function openText(file: OpenedFile): boolean {
  const r = parseStudy(file.text, file.name)
  if (!r.ok && looksLikeDelimitedTable(file.text)) {
    notice('error', `“${file.name}” is a table of values (like a sizer export), not a study: it was not opened`, [
      'Open… reads Motebench studies (.mote files). To read this file’s size bins into a sample, use “Import sizer file…” (Ctrl+I) or drop the file on the window.'
    ])
    return false
  }
  if (!r.ok) {
    notice(
      'error',
      `“${file.name}” was not opened: it has ${r.problems.length} problem${r.problems.length === 1 ? '' : 's'}`,
      r.problems.slice(0, 12).map((p) => `${p.path}: ${p.message}. ${p.fix}`)
    )
    return false
  }
  load(r.study, { name: file.name, path: file.path })
  if (r.warnings.length) notice('info', `Opened “${file.name}”`, r.warnings)
  return true
}

function confirmDiscard(): boolean {
  return !store().get().dirty || window.confirm('The study has unsaved changes. Discard them?')
}

export async function openStudy(): Promise<void> {
  if (host().kind === 'browser' && !confirmDiscard()) return
  const f = await host().openStudy()
  if (f) openText(f)
}

export function newStudy(): void {
  if (host().kind === 'desktop') return // the desktop menu opens a new window
  if (!confirmDiscard()) return
  load(blankStudy(), null)
}

export function openDemo(): void {
  if (!confirmDiscard()) return
  load(demoStudy(), null)
}

export async function save(saveAs = false): Promise<boolean> {
  const s = store().get()
  if (s.problems.length && !window.confirm(`The study has ${s.problems.length} input problem(s). Save it anyway? (It will not open again until they are fixed.)`)) return false
  const suggestedName = s.file?.name ?? `${fileStem(s.study.name)}.mote`
  const r = await host().saveStudy({ text: serializeStudy(s.study), path: s.file?.path, suggestedName, saveAs })
  if (!r) return false
  // instrument files added before this save (or kept relative to another folder) are kept relative to this file
  if (r.path && rebaseForSave(s.file?.path, r.path)) {
    const again = await host().saveStudy({ text: serializeStudy(store().get().study), path: r.path, suggestedName: r.name, saveAs: false })
    if (!again) return false
  }
  store().set({ file: r, dirty: false })
  void host().keepRecovery(null)
  return true
}

// ---------------------------------------------------------------------------------------------------------------
// Sizer files.

/** A sizer file read and waiting for the user's choices (unit, dates, negatives, rows) and where it goes. */
export interface PendingSizer {
  name: string
  text: string
  /** The table as read with the file's own statements, or undefined when a choice is needed first. */
  table?: SizerTable
  /** The choice the file needs before it can be read (unit, quantity, date order, year). */
  needs?: SizerChoiceNeeded
}

let pendingListener: ((p: PendingSizer | null) => void) | null = null
export const onPendingSizer = (l: (p: PendingSizer | null) => void): void => {
  pendingListener = l
}

const messageOf = (e: unknown): string => (e instanceof Error ? e.message : String(e))

/**
 * Reads a sizer export and opens the import dialog on it. A file the dialog's choices cannot help (no table,
 * a broken header, a single distribution with bad rows) is refused here with its line numbers.
 */
export function readSizer(file: OpenedFile): void {
  let table: SizerTable | undefined
  let needs: SizerChoiceNeeded | undefined
  try {
    table = parseSizerText(file.text, { fileName: file.name })
  } catch (e) {
    if (e instanceof SizerChoiceNeeded) needs = e
    else {
      notice('error', `“${file.name}” was not imported`, [e instanceof InputError ? e.message : messageOf(e)])
      return
    }
  }
  if (table) {
    // one distribution with a bad bin cannot be read in part; negative values the dialog can set to 0
    const fatal = table.layout !== 'time-rows' ? table.rejected.filter((r) => !/negative/.test(r.reason)) : []
    if (fatal.length) {
      notice(
        'error',
        `“${file.name}” was not imported: ${fatal.length} line${fatal.length === 1 ? '' : 's'} could not be read`,
        fatal.slice(0, 10).map((r) => `line ${r.line}${r.column ? ` column ${r.column}` : ''}: ${r.reason}. ${r.fix}`)
      )
      return
    }
    if (!table.records.length && !table.rejected.length) {
      notice('error', `“${file.name}” was not imported`, ['The file has a table but no distribution in it.'])
      return
    }
  }
  pendingListener?.({ name: file.name, text: file.text, table, needs })
}

/** Shows the station record and asks for instrument files to add to its campaign. */
export async function addInstrumentFiles(): Promise<void> {
  showView('record')
  const got = await host().openInstrumentFiles()
  if (got && got.length > 0) await addFiles(got)
}

export async function importSizer(): Promise<void> {
  const f = await host().openSizerFile()
  if (f) readSizer(f)
}

// ---------------------------------------------------------------------------------------------------------------
// Exports and report.

/** Each sample's figures on screen, with how they stand to its current inputs. */
function exportedResults(): (ExportedResult | undefined)[] {
  const s = store().get()
  return s.ids.map((id) => {
    const x = sampleState(s, id)
    if (!x?.result) return undefined
    return { result: x.result, status: !x.current ? 'out-of-date' : x.preview ? 'quick' : 'current' }
  })
}

/** Says, after an export, which samples' figures were not from their current inputs (the file says it too). */
function noteStatus(results: (ExportedResult | undefined)[]): void {
  const lines = statusLines(store().get().study, results)
  if (lines.length) notice('info', 'Some exported figures are not from the current inputs', [...lines, 'Each row says so in its status column. Export again once the figures are up to date.'])
}

export async function exportCsv(): Promise<void> {
  const s = store().get()
  const results = exportedResults()
  if (await host().exportFile({ suggestedName: `${fileStem(s.study.name)}-results.csv`, kind: 'csv', text: resultsCsv(s.study, results) })) noteStatus(results)
}

export async function exportJson(): Promise<void> {
  const s = store().get()
  const results = exportedResults()
  if (await host().exportFile({ suggestedName: `${fileStem(s.study.name)}-results.json`, kind: 'json', text: resultsJson(s.study, results) })) noteStatus(results)
}

export const openReport = (): void => store().set({ reportOpen: true })

export async function printReport(): Promise<void> {
  await host().printReport({ suggestedName: `${fileStem(store().get().study.name)}-report.pdf` })
}

export function run(command: MenuCommand): void {
  switch (command) {
    case 'new':
      return newStudy()
    case 'open':
      return void openStudy()
    case 'save':
      return void save(false)
    case 'save-as':
      return void save(true)
    case 'import-sizer':
      return void importSizer()
    case 'export-csv':
      return void exportCsv()
    case 'export-json':
      return void exportJson()
    case 'export-report':
      return openReport()
    case 'undo':
      return undo()
    case 'redo':
      return redo()
    case 'cautions':
      return store().set({ cautionsOpen: true })
    case 'catalogue':
      return openCatalogue()
    case 'add-instrument-files':
      return void addInstrumentFiles()
    case 'save-and-close':
      void save(false).then((ok) => ok && host().closeWindow())
      return
  }
}

export { cancel }

// ---------------------------------------------------------------------------------------------------------------
// The host's view of the window (the recovery copy: recovery.ts).

export function keepHostInformed(): void {
  let last = ''
  store().subscribe(() => {
    const s = store().get()
    const key = `${s.study.name}|${s.dirty}|${s.pristine}`
    if (key === last) return
    last = key
    host().setState({ title: s.file?.name ?? s.study.name, dirty: s.dirty, pristine: s.pristine })
  })
}
