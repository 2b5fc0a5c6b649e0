// Recovery copies of unsaved studies: one file per window, found again after a crash, removed after a clean close.
import { mkdir, readdir, readFile, rename, rm } from 'node:fs/promises'
import { join } from 'node:path'
import type { RecoveryCopy } from './host-api.ts'
import { writeFileAtomically } from './files.ts'
import { recoveryCopy } from './ipc-schemas.ts'

/** A copy left by a process that is no longer running. */
export interface LeftoverCopy {
  file: string
  copy: RecoveryCopy
}

export interface RecoveryStoreOptions {
  /** The process that owns the copies this store writes (default: this one). */
  pid?: number
  /** Whether a process is still running (default: asks the operating system). */
  isRunning?: (pid: number) => boolean
}

const COPY_NAME = /^window-(\d+)-(\d+)\.json$/
/** Temporary files of an unfinished write (files.ts names them `.NAME.PID-RANDOM.tmp`). */
const UNFINISHED_NAME = /^\.window-(\d+)-\d+\.json\.\d+-[0-9a-f]+\.tmp$/

function processIsRunning(pid: number): boolean {
  try {
    process.kill(pid, 0)
    return true
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM'
  }
}

/**
 * The copies in one folder. Each file is named after the process and window that write it, so two running
 * instances never take each other's copies: only the copies of a process that has gone are leftovers.
 */
export class RecoveryStore {
  readonly dir: string
  private readonly pid: number
  private readonly isRunning: (pid: number) => boolean
  private count = 0

  constructor(dir: string, options: RecoveryStoreOptions = {}) {
    this.dir = dir
    this.pid = options.pid ?? process.pid
    this.isRunning = options.isRunning ?? processIsRunning
  }

  /** A new file for one window's copies (nothing is written until `keep`). */
  newSlot(): string {
    return join(this.dir, `window-${this.pid}-${++this.count}.json`)
  }

  /** Writes the window's copy, replacing the previous one whole. */
  async keep(slot: string, copy: RecoveryCopy): Promise<void> {
    await mkdir(this.dir, { recursive: true })
    await writeFileAtomically(slot, JSON.stringify(copy), { backup: false })
  }

  /** Removes the window's copy: it was saved, closed on purpose, or the user declined to restore it. */
  async discard(slot: string): Promise<void> {
    await rm(slot, { force: true })
  }

  /**
   * The copies left by processes that ended without closing their windows, newest first. Copies that cannot be
   * read, and unfinished writes, are removed: they could never be restored.
   */
  async leftovers(): Promise<LeftoverCopy[]> {
    let names: string[]
    try {
      names = await readdir(this.dir)
    } catch {
      return []
    }
    const found: LeftoverCopy[] = []
    for (const name of names) {
      const file = join(this.dir, name)
      const unfinished = UNFINISHED_NAME.exec(name)
      if (unfinished) {
        if (this.ended(Number(unfinished[1]))) await rm(file, { force: true })
        continue
      }
      const owned = COPY_NAME.exec(name)
      if (!owned || !this.ended(Number(owned[1]))) continue
      const copy = await readCopy(file)
      if (copy) found.push({ file, copy })
      else await rm(file, { force: true })
    }
    return found.sort((a, b) => Date.parse(b.copy.savedAt) - Date.parse(a.copy.savedAt))
  }

  /** Takes a leftover copy over for a new window of this process; null if another instance took it first. */
  async adopt(leftover: LeftoverCopy): Promise<string | null> {
    const slot = this.newSlot()
    try {
      await rename(leftover.file, slot)
      return slot
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code === 'ENOENT') return null
      throw e
    }
  }

  private ended(pid: number): boolean {
    return pid !== this.pid && !this.isRunning(pid)
  }
}

async function readCopy(file: string): Promise<RecoveryCopy | null> {
  try {
    const parsed = recoveryCopy.safeParse(JSON.parse(await readFile(file, 'utf8')))
    return parsed.success ? parsed.data : null
  } catch {
    return null
  }
}
