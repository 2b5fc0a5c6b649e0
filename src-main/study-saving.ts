// Reading files the user chose, and saving studies without silently overwriting changes made on disk meanwhile.
import type { MessageBoxSyncOptions } from 'electron'
import { readFile, stat } from 'node:fs/promises'
import { basename } from 'node:path'
import { FileChangedError, saveTextAtomically, type SaveIo } from './files.ts'
import type { OpenedFile } from './host-api.ts'
import { MAX_TEXT } from './ipc-schemas.ts'
import { wholeTextFingerprint } from '../src-core/field/fingerprint.ts'

/** A file that could not be read, with what to do about it. */
export class FileReadError extends Error {
  readonly path: string
  constructor(path: string, problem: string, fix: string) {
    super(`${path}: ${problem}. ${fix}`)
    this.name = 'FileReadError'
    this.path = path
  }
}

function readFailure(path: string, e: unknown): FileReadError {
  const code = (e as NodeJS.ErrnoException).code
  if (code === 'ENOENT') return new FileReadError(path, 'the file is not there (moved, renamed or deleted)', 'Find it and open it again with File ▸ Open study.')
  if (code === 'EACCES' || code === 'EPERM') return new FileReadError(path, 'you may not read this file', 'Check its permissions, or copy it somewhere you can read it.')
  if (code === 'EISDIR') return new FileReadError(path, 'this is a folder, not a file', 'Choose a file inside it.')
  return new FileReadError(path, `the file could not be read (${(e as Error).message})`, 'Check the disk and try again.')
}

/** Reads a text file the user chose; refuses folders and files too large to be a study or a sizer export. */
export async function readChosenFile(path: string): Promise<{ file: OpenedFile; mtimeMs: number; size: number }> {
  try {
    const before = await stat(path)
    if (before.isDirectory()) throw Object.assign(new Error('is a directory'), { code: 'EISDIR' })
    if (before.size > MAX_TEXT) {
      throw new FileReadError(path, `the file is ${Math.round(before.size / 1e6)} MB, more than the ${MAX_TEXT / 1e6} MB a study or sizer export may have`, 'Open a smaller file, or split the sizer export.')
    }
    const text = await readFile(path, 'utf8')
    return { file: { name: basename(path), path, text }, mtimeMs: before.mtimeMs, size: before.size }
  } catch (e) {
    throw e instanceof FileReadError ? e : readFailure(path, e)
  }
}

/**
 * Reads an instrument file of a campaign (chosen, or by the path a study keeps) with the fingerprint of its whole
 * text: the host holds all of it here anyway, so a change anywhere in the file is noticed (the page, which
 * should not pass over a year of rows, can only fingerprint the beginning and the end).
 */
export async function readInstrumentFile(path: string): Promise<OpenedFile> {
  const { file } = await readChosenFile(path)
  return { ...file, fingerprint: wholeTextFingerprint(file.text) }
}

/** The question shown when a study changed on disk since this window read or wrote it. */
export function overwriteQuestion(path: string): MessageBoxSyncOptions {
  return {
    type: 'warning',
    buttons: ['Overwrite', 'Cancel'],
    defaultId: 1,
    cancelId: 1,
    message: 'The file changed on disk since it was opened here.',
    detail: `${path}\n\nOverwrite it with this window's study? (The previous version is kept as ${basename(path)}.bak.)`
  }
}

/** True only when the user pressed Overwrite. */
export const overwriteChosen = (buttonIndex: number): boolean => buttonIndex === 0

/**
 * The studies this process read or wrote, with the modification time and size each had then. A save over a file
 * that has changed since asks first (`confirmOverwrite`); without a record, the file is written as is.
 */
export class StudyFiles {
  private readonly stamps = new Map<string, { mtimeMs: number; size: number }>()
  private readonly io: Partial<SaveIo> | undefined

  constructor(options: { io?: Partial<SaveIo> } = {}) {
    this.io = options.io
  }

  /** Reads a study and remembers its state on disk. */
  async read(path: string): Promise<OpenedFile> {
    const r = await readChosenFile(path)
    this.stamps.set(path, { mtimeMs: r.mtimeMs, size: r.size })
    return r.file
  }

  /** Saves study text; resolves to false when the file changed on disk and the user chose not to overwrite it. */
  async save(path: string, text: string, confirmOverwrite: (path: string) => boolean | Promise<boolean>): Promise<boolean> {
    const stamp = this.stamps.get(path)
    const expected = stamp ? { expectedMtimeMs: stamp.mtimeMs, expectedSize: stamp.size } : {}
    let saved
    try {
      saved = await saveTextAtomically(path, text, { ...expected, io: this.io })
    } catch (e) {
      if (!(e instanceof FileChangedError)) throw e
      if (!(await confirmOverwrite(path))) return false
      saved = await saveTextAtomically(path, text, { force: true, io: this.io })
    }
    this.stamps.set(path, { mtimeMs: saved.mtimeMs, size: saved.size })
    return true
  }
}
