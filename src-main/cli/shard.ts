// Shards: one run of series, merge or uncertainty split into N contiguous parts (--shard K/N) that run apart (on
// a cluster's array job) and are put back together by `motebench join`. Each shard's output starts with one
// shard line: its K/N, the command, a fingerprint of the run (inputs' contents and the options that change the
// output) and how many head lines follow that every shard repeats (metadata, column names). join keeps the head
// once, drops the shard lines and checks that the shards are all there, once each, and of the same run.
import { createHash } from 'node:crypto'
import { createReadStream } from 'node:fs'
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
 * Counts the lines of a file as node:readline splits them (a line ends at \n, \r\n or a lone \r; a last line
 * without a break counts), reading it as bytes.
 */
export async function countLines(path: string): Promise<number> {
  let n = 0
  let last = 10
  let pendingCr = false
  for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) {
    const b = chunk as Buffer
    if (b.length === 0) continue
    if (pendingCr && b[0] !== 10) n++ // a lone \r at the end of the previous chunk
    for (let i = b.indexOf(10); i >= 0; i = b.indexOf(10, i + 1)) n++
    for (let i = b.indexOf(13); i >= 0; i = b.indexOf(13, i + 1)) if (i + 1 < b.length && b[i + 1] !== 10) n++
    pendingCr = b[b.length - 1] === 13
    last = b[b.length - 1]
  }
  if (pendingCr) return n + 1
  return last === 10 ? n : n + 1
}
