// motebench join SHARD...: the outputs of the shards of one run (--shard K/N of series, merge or uncertainty)
// put together in K order into the file the run would have written on one machine, byte for byte.
import { createReadStream, createWriteStream } from 'node:fs'
import { open, rename, unlink } from 'node:fs/promises'
import { EXIT_OK, readArgs, UsageError } from './common.ts'
import { parseShardLine, type ShardInfo } from './shard.ts'

export const joinHelp = `motebench join SHARD... [--out FILE]: the outputs of a run's shards as the run's one output
  SHARD...     the files written by series, merge or uncertainty with --shard K/N (in any order; a shell
               pattern such as "part-*.csv" will do)
  --out FILE   write the joined file to FILE (it appears only when complete) instead of standard output
Each shard's first line says its K/N, its command and run (a fingerprint of the inputs and options); the head
that every shard repeats (metadata, column names) is kept once, then the shards' rows follow in K order. join
refuses a missing or repeated shard and shards of different runs. Exit status 0, 2 when it refuses.`

interface Part extends ShardInfo {
  path: string
  head: string
  bodyStart: number
}

/** The shard line and head of a file, and where its rows begin (in bytes). */
async function readHead(path: string): Promise<Part> {
  const handle = await open(path, 'r')
  try {
    let bytes = Buffer.alloc(0)
    let pos = 0
    let info: ShardInfo | undefined
    let breaks: number[] = []
    for (;;) {
      const chunk = Buffer.alloc(1 << 16)
      const { bytesRead } = await handle.read(chunk, 0, chunk.length, pos)
      pos += bytesRead
      bytes = Buffer.concat([bytes, chunk.subarray(0, bytesRead)])
      breaks = []
      for (let i = bytes.indexOf(10); i >= 0; i = bytes.indexOf(10, i + 1)) breaks.push(i)
      if (!info && breaks.length > 0) {
        info = parseShardLine(bytes.subarray(0, breaks[0]).toString('utf8'))
        if (!info) throw new UsageError(`join: ${path} is not the output of a shard (its first line is not "motebench shard K/N ..."); make each part with --shard K/N`)
      }
      if (info && breaks.length >= info.headLines + 1) {
        const end = breaks[info.headLines] + 1
        return { ...info, path, head: bytes.subarray(breaks[0] + 1, end).toString('utf8'), bodyStart: end }
      }
      if (bytesRead === 0) throw new UsageError(`join: ${path} ends inside its head (${info ? `${info.headLines} lines after the shard line` : 'no shard line'}); the shard did not finish: run it again`)
    }
  } finally {
    await handle.close()
  }
}

/** Checks that the parts are every shard of one run, once each; returns them in K order. */
export function orderShards(parts: Part[]): Part[] {
  const first = parts[0]
  for (const p of parts.slice(1)) {
    if (p.fingerprint === first.fingerprint && p.n !== first.n) {
      throw new UsageError(`join: ${p.path} is shard ${p.k}/${p.n} but ${first.path} is shard ${first.k}/${first.n}; give the shards of one split (the same N)`)
    }
    if (p.command !== first.command || p.fingerprint !== first.fingerprint || p.n !== first.n || p.headLines !== first.headLines || p.head !== first.head) {
      throw new UsageError(
        `join: ${p.path} (shard ${p.k}/${p.n} of ${p.command} run ${p.fingerprint}) is not of the same run as ${first.path} (shard ${first.k}/${first.n} of ${first.command} run ${first.fingerprint}); join the shards of one run only (same inputs and options)`
      )
    }
  }
  const byK = new Map<number, Part>()
  for (const p of parts) {
    const seen = byK.get(p.k)
    if (seen) throw new UsageError(`join: shard ${p.k}/${p.n} is given twice (${seen.path} and ${p.path}); give each shard once`)
    byK.set(p.k, p)
  }
  const missing: string[] = []
  for (let k = 1; k <= first.n; k++) if (!byK.has(k)) missing.push(`${k}/${first.n}`)
  if (missing.length > 0) {
    const list = missing.length > 10 ? `${missing.slice(0, 10).join(', ')} and ${missing.length - 10} more` : missing.join(', ')
    throw new UsageError(`join: shard${missing.length === 1 ? '' : 's'} ${list} of ${first.command} run ${first.fingerprint} ${missing.length === 1 ? 'is' : 'are'} missing; run ${missing.length === 1 ? 'it' : 'them'} (--shard K/N with the same inputs and options) and give all ${first.n}`)
  }
  return [...byK.values()].sort((a, b) => a.k - b.k)
}

export async function runJoin(argv: string[]): Promise<number> {
  const { values, positionals } = readArgs('join', argv, { out: { type: 'string' } }, true)
  if (positionals.length === 0) throw new UsageError('join: give the shards\' output files, e.g. "motebench join part-*.csv --out record.csv"')
  const parts = orderShards(await Promise.all(positionals.map(readHead)))
  const out = values.out
  const tmp = out !== undefined ? `${out}.tmp-${process.pid}` : undefined
  const sink = tmp !== undefined ? createWriteStream(tmp) : process.stdout
  try {
    const write = (text: string | Buffer) => new Promise<void>((resolve, reject) => sink.write(text, (e) => (e ? reject(e) : resolve())))
    await write(parts[0].head)
    for (const p of parts) for await (const chunk of createReadStream(p.path, { start: p.bodyStart, highWaterMark: 1 << 20 })) await write(chunk as Buffer)
    if (tmp !== undefined) {
      await new Promise<void>((resolve, reject) => (sink as ReturnType<typeof createWriteStream>).end((e?: Error | null) => (e ? reject(e) : resolve())))
      await rename(tmp, out!)
    }
  } catch (e) {
    if (tmp !== undefined) {
      ;(sink as ReturnType<typeof createWriteStream>).destroy()
      await unlink(tmp).catch(() => {})
    }
    throw e
  }
  process.stderr.write(`join: ${parts.length} shard${parts.length === 1 ? '' : 's'} of ${parts[0].command} run ${parts[0].fingerprint}${out !== undefined ? ` written to ${out}` : ''}\n`)
  return EXIT_OK
}
