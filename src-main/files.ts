// Study files on disk (Node): loading with the file's modification time, and saving atomically.
//
// Saving (saveTextAtomically; writeFileAtomically for bytes, e.g. PNG and PDF exports):
//   1. if the caller recorded the file's mtime (and size) when it opened it, and the file on disk now differs,
//      refuse with FileChangedError (someone else saved it meanwhile) unless `force`;
//   2. write the new text to a temporary file in the same directory (`.NAME.PID-RANDOM.tmp`) and fsync it;
//   3. copy the current file to `PATH.bak` (e.g. `demo.mote.bak`): the previous version, one level deep;
//   4. rename the temporary file over PATH (atomic on one file system) and fsync the directory.
// The old file stays in place until the rename; if any step fails, the temporary file is removed and the
// old file is left as it was.
import { randomBytes } from 'node:crypto'
import * as fsp from 'node:fs/promises'
import { basename, dirname, join } from 'node:path'
import { parseStudy, serializeStudy, type Study } from '../src-core/index.ts'
import { StudyFileError } from './studyFileError.ts'

/** The file on disk changed since the caller read it (or was deleted). */
export class FileChangedError extends Error {
  readonly path: string
  readonly expectedMtimeMs: number
  /** undefined when the file is gone. */
  readonly actualMtimeMs: number | undefined

  constructor(path: string, expectedMtimeMs: number, actualMtimeMs: number | undefined) {
    super(
      actualMtimeMs === undefined
        ? `${path} was deleted or moved since it was opened; saving was refused so nothing is lost. Save it under another name, or save again with force to recreate it.`
        : `${path} was changed on disk (by another program or window) since it was opened; saving was refused so those changes are not overwritten. Reopen it, or save under another name, or save again with force to overwrite.`
    )
    this.name = 'FileChangedError'
    this.path = path
    this.expectedMtimeMs = expectedMtimeMs
    this.actualMtimeMs = actualMtimeMs
  }
}

export { StudyFileError }

/** The file system calls saving uses; tests replace some to simulate failures. */
export interface SaveIo {
  open: typeof fsp.open
  rename: typeof fsp.rename
  copyFile: typeof fsp.copyFile
  stat: typeof fsp.stat
  unlink: typeof fsp.unlink
}

const nodeIo: SaveIo = { open: fsp.open, rename: fsp.rename, copyFile: fsp.copyFile, stat: fsp.stat, unlink: fsp.unlink }

export interface SaveOptions {
  /** mtime (ms) of the file when the caller read it; a different mtime on disk refuses the save. */
  expectedMtimeMs?: number
  /** Size (bytes) when read; checked with expectedMtimeMs. */
  expectedSize?: number
  /** Save even if the file changed on disk. */
  force?: boolean
  /** Keep the previous file as PATH.bak (default true). */
  backup?: boolean
  /** For tests: replacement file system calls. */
  io?: Partial<SaveIo>
}

export interface SavedFile {
  path: string
  /** Record these for the next save. */
  mtimeMs: number
  size: number
  /** Where the previous version was kept, if there was one. */
  backupPath?: string
}

/** Where saveTextAtomically keeps the previous version of `path`. */
export function backupPathFor(path: string): string {
  return `${path}.bak`
}

async function statOrUndefined(io: SaveIo, path: string) {
  try {
    return await io.stat(path)
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return undefined
    throw e
  }
}

/** Writes `text` to `path` atomically (see the top of this file). Throws FileChangedError, or the fs error. */
export function saveTextAtomically(path: string, text: string, options: SaveOptions = {}): Promise<SavedFile> {
  return writeFileAtomically(path, text, options)
}

/** Writes text (as UTF-8) or bytes to `path` atomically, as saveTextAtomically does. */
export async function writeFileAtomically(path: string, data: string | Uint8Array, options: SaveOptions = {}): Promise<SavedFile> {
  const io: SaveIo = { ...nodeIo, ...options.io }
  const current = await statOrUndefined(io, path)
  if (options.expectedMtimeMs !== undefined && !options.force) {
    const changed = !current || current.mtimeMs !== options.expectedMtimeMs || (options.expectedSize !== undefined && current.size !== options.expectedSize)
    if (changed) throw new FileChangedError(path, options.expectedMtimeMs, current?.mtimeMs)
  }
  const dir = dirname(path)
  const tmp = join(dir, `.${basename(path)}.${process.pid}-${randomBytes(4).toString('hex')}.tmp`)
  let tmpExists = false
  try {
    const handle = await io.open(tmp, 'wx', current ? current.mode & 0o777 : 0o644)
    tmpExists = true
    try {
      await handle.writeFile(data, typeof data === 'string' ? 'utf8' : undefined)
      await handle.sync()
    } finally {
      await handle.close()
    }
    let backupPath: string | undefined
    if (current && options.backup !== false) {
      backupPath = backupPathFor(path)
      await io.copyFile(path, backupPath)
    }
    await io.rename(tmp, path)
    tmpExists = false
    await syncDirectory(io, dir)
    const after = await io.stat(path)
    return { path, mtimeMs: after.mtimeMs, size: after.size, ...(backupPath ? { backupPath } : {}) }
  } finally {
    if (tmpExists) await io.unlink(tmp).catch(() => {})
  }
}

/** Makes the rename durable; some platforms cannot open a directory, which is fine to skip. */
async function syncDirectory(io: SaveIo, dir: string): Promise<void> {
  let handle: fsp.FileHandle | undefined
  try {
    handle = await io.open(dir, 'r')
    await handle.sync()
  } catch {
    // EISDIR/EPERM/EINVAL on some systems: the data itself is already synced.
  } finally {
    await handle?.close().catch(() => {})
  }
}

export interface LoadedStudy {
  path: string
  study: Study
  warnings: string[]
  /** Pass to saveStudyFile/saveTextAtomically as expectedMtimeMs / expectedSize. */
  mtimeMs: number
  size: number
}

/** Reads and validates a study file. Throws StudyFileError listing every problem, or the fs error. */
export async function loadStudyFile(path: string): Promise<LoadedStudy> {
  const before = await fsp.stat(path)
  const text = await fsp.readFile(path, 'utf8')
  const result = parseStudy(text, basename(path))
  if (!result.ok) throw new StudyFileError(path, result.problems)
  return { path, study: result.study, warnings: result.warnings, mtimeMs: before.mtimeMs, size: before.size }
}

/** Saves a study (serializeStudy) atomically; see saveTextAtomically. */
export function saveStudyFile(path: string, study: Study, options: SaveOptions = {}): Promise<SavedFile> {
  return saveTextAtomically(path, serializeStudy(study), options)
}
