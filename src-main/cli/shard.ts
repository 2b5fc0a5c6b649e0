// Shards: one run of series, merge or uncertainty split into N contiguous parts (--shard K/N) that run apart (on
// a cluster's array job) and are put back together by `motebench join`. Each shard's output starts with one
// shard line: its K/N, the command, a fingerprint of the run (inputs' contents and the options that change the
// output) and how many head lines follow that every shard repeats (metadata, column names). join keeps the head
// once, drops the shard lines and checks that the shards are all there, once each, and of the same run.
import { createHash } from 'node:crypto'
import { createReadStream } from 'node:fs'
import { InputError } from '../../src-core/index.ts'
import { UsageError } from './common.ts'

export interface Shard {
  k: number
  n: number
}

/** "K/N" typed on the command line (1 ≤ K ≤ N ≤ 100000), or undefined when not given. */
export function readShard(text: string | undefined, command: string): Shard | undefined {
  if (text === undefined) return undefined
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text)
  const k = m ? Number(m[1]) : NaN
  const n = m ? Number(m[2]) : NaN
  if (!m || !(n >= 1 && n <= 100000 && k >= 1 && k <= n)) throw new UsageError(`${command}: --shard "${text}" is not K/N with 1 ≤ K ≤ N, e.g. --shard 2/8 (the second of eight parts)`)
  return { k, n }
}

/** The part [start, end) of `total` items that shard K of N takes: contiguous, in order, sizes differing by at most one. */
export function shardRange(total: number, s: Shard): [number, number] {
  return [Math.floor(((s.k - 1) * total) / s.n), Math.floor((s.k * total) / s.n)]
}

/** SHA-256 of the files' contents and the options, 16 hex digits: equal for every shard of one run. */
export async function runFingerprint(command: string, files: readonly string[], options: Record<string, unknown>): Promise<string> {
  const hash = createHash('sha256')
  hash.update(`${command}\n`)
  for (const f of files) {
    hash.update(`file ${files.indexOf(f)}\n`)
    for await (const chunk of createReadStream(f)) hash.update(chunk as Buffer)
  }
  const keys = Object.keys(options).sort()
  hash.update(JSON.stringify(keys.map((k) => [k, options[k] ?? null])))
  return hash.digest('hex').slice(0, 16)
}

/**
 * The shard line (no separator characters, so a sizer reader's separator detection is not misled):
 * "motebench shard 2/3 - series run 0123456789abcdef - head 1 lines".
 */
export function shardLine(command: string, s: Shard, fingerprint: string, headLines: number): string {
  return `motebench shard ${s.k}/${s.n} - ${command} run ${fingerprint} - head ${headLines} lines\n`
}

const SHARD_LINE = /^motebench shard (\d+)\/(\d+) - (\S+) run ([0-9a-f]+) - head (\d+) lines$/

export interface ShardInfo extends Shard {
  command: string
  fingerprint: string
  headLines: number
}

export function parseShardLine(line: string): ShardInfo | undefined {
  const m = SHARD_LINE.exec(line.replace(/\r$/, ''))
  if (!m) return undefined
  return { k: Number(m[1]), n: Number(m[2]), command: m[3], fingerprint: m[4], headLines: Number(m[5]) }
}

/**
 * Calls `onBreak(after)` for each line break of the file from byte `start` on (a line ends at \n, \r\n or a lone
 * \r, as node:readline splits it), in order, with the offset of the byte after the break, where the next line
 * starts; `start` must be where a line starts, and `onBreak` returning false stops the reading. A chunk without a
 * carriage return is searched for \n alone. Returns the file's last byte (10 when nothing was read; -1 when stopped).
 */
async function eachBreak(path: string, start: number, onBreak: (after: number) => boolean | void): Promise<number> {
  let last = 10
  let pendingCr = false
  let base = start
  let go = true
  const at = (after: number) => void (go &&= onBreak(after) !== false)
  for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20, start })) {
    const b = chunk as Buffer
    if (b.length === 0) continue
    if (!pendingCr && b.indexOf(13) < 0) {
      for (let i = b.indexOf(10); i >= 0 && go; i = b.indexOf(10, i + 1)) at(base + i + 1)
    } else {
      for (let i = 0; i < b.length && go; i++) {
        const c = b[i]
        if (pendingCr) {
          pendingCr = false
          if (c === 10) {
            at(base + i + 1) // \r\n across or within a chunk
            continue
          }
          at(base + i) // a lone \r
        }
        if (c === 10) at(base + i + 1)
        else if (c === 13) pendingCr = true
      }
    }
    if (!go) return -1
    last = b[b.length - 1]
    base += b.length
  }
  if (pendingCr) at(base)
  return last
}

/** Every LINE_STEP-th line's start is kept by lineIndex (for 10⁸ lines, 24,415 offsets). */
const LINE_STEP = 4096

/** A file's line count and where its lines start (lineIndex). */
export interface LineIndex {
  total: number
  /** The byte offset where line `line` (1-based, at most total) starts: read from the nearest kept start on. */
  offsetOf(line: number): Promise<number>
}

/**
 * The lines of a file as node:readline splits them, counted in one pass over its bytes that keeps the start of every
 * LINE_STEP-th line, so that where any line starts is found by reading at most LINE_STEP lines again (a shard that
 * begins deep in a long file seeks there instead of splitting every line before it).
 */
export async function lineIndex(path: string): Promise<LineIndex> {
  const starts = [0] // starts[m]: the offset of line 1 + m·LINE_STEP
  let breaks = 0
  const last = await eachBreak(path, 0, (after) => {
    if (++breaks % LINE_STEP === 0) starts.push(after)
  })
  // a last line without a break counts; after a final break there is no further line
  const total = last === 10 || last === 13 ? breaks : breaks + 1
  return {
    total,
    async offsetOf(line: number): Promise<number> {
      if (!(line >= 1 && line <= Math.max(1, total))) throw new Error(`lineIndex: line ${line} is not in 1..${total}`)
      const m = Math.floor((line - 1) / LINE_STEP)
      let toGo = line - 1 - m * LINE_STEP
      if (toGo === 0) return starts[m]
      let offset = -1
      await eachBreak(path, starts[m], (after) => {
        if (--toGo > 0) return true
        offset = after
        return false
      })
      if (offset < 0) throw new InputError(path, `line ${line} is no longer in the file: it changed while it was read`, 'Run the part again once the file is complete.')
      return offset
    }
  }
}
