// The recent-studies list: newest first, no repeats, at most a few, only files that still exist; kept as JSON.
import { mkdir, readFile, stat } from 'node:fs/promises'
import { dirname, resolve } from 'node:path'
import { writeFileAtomically, type SaveIo } from './files.ts'

export const RECENT_LIMIT = 8

/** `path` first, then the rest of `list` without it, at most `limit` entries. */
export function withStudyFirst(list: readonly string[], path: string, limit = RECENT_LIMIT): string[] {
  return [path, ...list.filter((p) => p !== path)].slice(0, Math.max(0, limit))
}

/** The list in a recent-studies file; anything that is not a list of paths counts as an empty list. */
export function readRecentList(text: string): string[] {
  let value: unknown
  try {
    value = JSON.parse(text)
  } catch {
    return []
  }
  if (!Array.isArray(value)) return []
  const paths = value.filter((p): p is string => typeof p === 'string' && p.length > 0)
  return paths.filter((p, i) => paths.indexOf(p) === i)
}

async function isFile(path: string): Promise<boolean> {
  try {
    return (await stat(path)).isFile()
  } catch {
    return false
  }
}

export interface RecentStudiesOptions {
  limit?: number
  /** Whether a study file is still there (default: it is a file on disk). */
  exists?: (path: string) => Promise<boolean>
  /** For tests: replacement file system calls for the atomic write. */
  io?: Partial<SaveIo>
}

/** The list kept in one JSON file; changes are made one at a time and written to a temporary file, then renamed. */
export class RecentStudies {
  readonly file: string
  private readonly limit: number
  private readonly exists: (path: string) => Promise<boolean>
  private readonly io: Partial<SaveIo> | undefined
  private queue: Promise<unknown> = Promise.resolve()

  constructor(file: string, options: RecentStudiesOptions = {}) {
    this.file = file
    this.limit = options.limit ?? RECENT_LIMIT
    this.exists = options.exists ?? isFile
    this.io = options.io
  }

  /** The studies, newest first, leaving out files that are gone. */
  async list(): Promise<string[]> {
    let text: string
    try {
      text = await readFile(this.file, 'utf8')
    } catch {
      return []
    }
    const paths = readRecentList(text)
    const present = await Promise.all(paths.map((p) => this.exists(p)))
    return paths.filter((_, i) => present[i]).slice(0, this.limit)
  }

  /** Puts a study first (opened or saved just now); resolves to the new list. */
  add(path: string): Promise<string[]> {
    return this.change((list) => withStudyFirst(list, resolve(path), this.limit))
  }

  private change(edit: (list: string[]) => string[]): Promise<string[]> {
    const next = this.queue.then(async () => {
      const list = edit(await this.list())
      await mkdir(dirname(this.file), { recursive: true })
      await writeFileAtomically(this.file, `${JSON.stringify(list, null, 2)}\n`, { backup: false, io: this.io })
      return list
    })
    this.queue = next.catch(() => {})
    return next
  }
}
