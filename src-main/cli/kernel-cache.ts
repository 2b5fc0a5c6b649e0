// The bins' kernels of `motebench series` (and its measured instruments' kernels) kept on disk between runs. A
// monitoring network runs series on each day's file with the same sizer bins, sample and wavelengths; the kernels
// (a few hundred size integrations, about 0.1 s, and most of a short file's run) are then the same every time.
// Kept as the exact doubles (packBinKernels), so a run with cached kernels writes the same numbers as one that
// integrates them.
//
// A cached file is used only for the same inputs (binKernelsInputs: composition, humidity, materials, wavelengths,
// bins, tolerance), the same build of the command line (out/cli/build-id, a hash of every built file, written by
// scripts/build-cli.mjs) and the same JavaScript engine (its Math functions' last bits may differ between
// versions). Where no build id is found (the TypeScript source, run by the tests in process) nothing is cached.
// A damaged file (its checksum, length or header wrong) is integrated again and overwritten.
//
// Where: MOTEBENCH_CACHE_DIR, else $XDG_CACHE_HOME/motebench, else ~/.cache/motebench; MOTEBENCH_CACHE_DIR=off
// turns it off. Files are written atomically (a temporary file renamed), a few kilobytes each; beyond
// MAX_FILES the oldest are removed.
import { createHash } from 'node:crypto'
import { mkdirSync, readdirSync, readFileSync, renameSync, statSync, unlinkSync, utimesSync, writeFileSync } from 'node:fs'
import { homedir, hostname } from 'node:os'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'

const MAGIC = 'motebench bin kernels 1'
const MAX_FILES = 500
const KEEP_FILES = 400
/** This machine's byte order, written in each file's header (a file of the other order is not read). */
const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1

/** How a run got its kernels, for the summary. */
export interface KernelSource {
  /** 'cache': read from `file`; 'computed': integrated (and stored in `file` when it could be). */
  how: 'cache' | 'computed'
  file?: string
  /** Why nothing was read or stored, when that is worth saying (a damaged file, a folder not writable). */
  note?: string
}

/** The cache's folder, or undefined when it is turned off. */
export function kernelCacheDir(env: NodeJS.ProcessEnv = process.env): string | undefined {
  const set = env.MOTEBENCH_CACHE_DIR?.trim()
  if (set) return set.toLowerCase() === 'off' ? undefined : set
  const base = env.XDG_CACHE_HOME && env.XDG_CACHE_HOME.trim() !== '' ? env.XDG_CACHE_HOME : join(homedir(), '.cache')
  return join(base, 'motebench')
}

let buildId: string | null | undefined

/** The built command line's id (out/cli/build-id beside this module once built), or null from the source. */
function currentBuildId(): string | null {
  if (buildId !== undefined) return buildId
  buildId = null
  if (!import.meta.url.endsWith('.mjs')) return buildId
  try {
    const text = readFileSync(fileURLToPath(new URL('./build-id', import.meta.url)), 'utf8').trim()
    if (/^[0-9a-f]{64}$/.test(text)) buildId = text
  } catch {
    // no id: nothing is cached
  }
  return buildId
}

const sha256 = (data: string | Uint8Array) => createHash('sha256').update(data).digest('hex')

/**
 * The file for these inputs, or undefined when nothing is cached (turned off, not the built command line, or no
 * home folder to put it in: the cache only saves time, so it never stops a run).
 */
export function kernelCacheFile(inputs: string, env: NodeJS.ProcessEnv = process.env): string | undefined {
  try {
    const dir = kernelCacheDir(env)
    const id = currentBuildId()
    if (!dir || !id) return undefined
    return join(dir, `${sha256(`${MAGIC}\n${id}\n${process.versions.v8}\n${process.arch}\n${inputs}`)}.bin`)
  } catch {
    return undefined
  }
}

/**
 * The cached figures of `file` (exactly `length` doubles), or a note saying why they cannot be used; undefined
 * note when there is simply no file yet.
 */
export function readKernelCache(file: string, length: number): { values?: Float64Array; note?: string } {
  let bytes: Buffer
  try {
    bytes = readFileSync(file)
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'ENOENT' ? {} : { note: `could not read ${file} (${(e as Error).message})` }
  }
  const newline = bytes.indexOf(10)
  const damaged = { note: `${file} was damaged and is made again` }
  if (newline < 0) return damaged
  let header: { magic?: unknown; length?: unknown; sha256?: unknown; littleEndian?: unknown }
  try {
    header = JSON.parse(bytes.toString('utf8', 0, newline))
  } catch {
    return damaged
  }
  const payload = bytes.subarray(newline + 1)
  if (header.magic !== MAGIC || header.length !== length || header.littleEndian !== LITTLE_ENDIAN || payload.length !== 8 * length || header.sha256 !== sha256(payload)) return damaged
  // copied into an array of its own (the file's bytes need not be 8-byte aligned)
  const values = new Float64Array(length)
  new Uint8Array(values.buffer).set(payload)
  try {
    // used now: the last to be removed when the folder is pruned
    const now = new Date()
    utimesSync(file, now, now)
  } catch {
    // read-only: it is still used
  }
  return { values }
}

/**
 * Kernels for `inputs` (a text naming everything they depend on): read from the cache when an earlier run kept them
 * (`length` figures, given to `make` as its `integrated`), else made by `make()` and kept (`pack` gives their
 * figures). Where they came from is in `source`, for the summary.
 */
export function keptKernels<K>(inputs: string, length: number, make: (integrated?: Float64Array) => K, pack: (k: K) => Float64Array): { kernels: K; source: KernelSource } {
  const file = kernelCacheFile(inputs)
  const cached = file ? readKernelCache(file, length) : {}
  const kernels = make(cached.values)
  const stored = file && !cached.values ? writeKernelCache(file, pack(kernels)) : undefined
  return { kernels, source: { how: cached.values ? 'cache' : 'computed', file, note: stored ?? cached.note } }
}

/**
 * The summary's line on where kernels came from (`what`: "bin kernels", ...; `inputs`: what they depend on, in
 * words), undefined for none.
 */
export function kernelSourceLine(what: string, sources: KernelSource[], inputs = 'composition, humidity, wavelengths, bins and tolerance'): string | undefined {
  if (sources.length === 0) return undefined
  const file = sources.find((k) => k.file)?.file
  const notes = [...new Set(sources.map((k) => k.note).filter((n): n is string => n !== undefined))]
  const head = sources.every((k) => k.how === 'cache')
    ? `${what}: read from ${file} (kept by an earlier run with the same ${inputs})`
    : file
      ? `${what}: integrated, and kept in ${file} for later runs with the same inputs`
      : `${what}: integrated${kernelCacheDir() ? '' : ' (not kept: MOTEBENCH_CACHE_DIR is off)'}`
  return [head, ...notes.map((n) => `  ${n}`)].join('\n  ')
}

/** Stores `values` in `file` (atomically); a note when it could not. Removes the oldest files beyond MAX_FILES. */
export function writeKernelCache(file: string, values: Float64Array): string | undefined {
  const dir = dirname(file)
  // the host too: runs of an array job on several machines may share one cache folder
  const tmp = `${file}.${hostname()}-${process.pid}.tmp`
  try {
    mkdirSync(dir, { recursive: true })
    const payload = new Uint8Array(values.buffer, values.byteOffset, values.byteLength)
    const header = JSON.stringify({ magic: MAGIC, length: values.length, littleEndian: LITTLE_ENDIAN, sha256: sha256(payload) })
    writeFileSync(tmp, Buffer.concat([Buffer.from(header + '\n', 'utf8'), payload]))
    renameSync(tmp, file)
  } catch (e) {
    try {
      unlinkSync(tmp)
    } catch {
      // not written
    }
    return `the kernels could not be kept in ${dir} (${(e as Error).message}); set MOTEBENCH_CACHE_DIR to a writable folder, or to off`
  }
  prune(dir)
  return undefined
}

/** Removes the oldest cached files when there are more than MAX_FILES (quietly: the cache only saves time). */
function prune(dir: string): void {
  try {
    const names = readdirSync(dir).filter((n) => n.endsWith('.bin'))
    if (names.length <= MAX_FILES) return
    const byAge = names.map((n) => ({ n, t: statSync(join(dir, n)).mtimeMs })).sort((a, b) => a.t - b.t)
    for (const { n } of byAge.slice(0, names.length - KEEP_FILES)) unlinkSync(join(dir, n))
  } catch {
    // another run may be pruning at the same time
  }
}
