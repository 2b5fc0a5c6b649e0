// The lines of `motebench series`'s sizer file, read as a stream (see fileLines and fileLinesFromBytes).
import { open, type FileHandle } from 'node:fs/promises'
import { StringDecoder } from 'node:string_decoder'

/**
 * Splits text given in chunks into lines as node:readline splits them (at \r\n, \n or a lone \r; no empty last
 * line after a final line break). A chunk without a carriage return is cut at each \n by indexOf, its lines sliced
 * from the chunk itself (only the line that straddles two chunks is joined); a chunk with a carriage return goes
 * character by character. (Joining the rest of a chunk to the next and splitting the whole by a regular expression
 * copied every chunk once more: in a micro-benchmark here, 15 MB in 256 kB chunks took 200–250 ms that way against
 * under 50 ms, at a load of 9.)
 */
class TextLines {
  private rest = ''

  push(chunk: string): string[] {
    const lines: string[] = []
    const r = chunk.indexOf('\r')
    if (r < 0 && !this.rest.endsWith('\r')) {
      let at = 0
      let end = chunk.indexOf('\n')
      if (end >= 0) {
        lines.push(this.rest + chunk.slice(0, end))
        this.rest = ''
        at = end + 1
        for (end = chunk.indexOf('\n', at); end >= 0; end = chunk.indexOf('\n', at)) {
          lines.push(chunk.slice(at, end))
          at = end + 1
        }
      }
      this.rest = at === 0 ? this.rest + chunk : chunk.slice(at)
    } else {
      const text = this.rest + chunk
      // a \r at the end may be the first half of \r\n: keep it for the next chunk
      const to = text.charCodeAt(text.length - 1) === 13 ? text.length - 1 : text.length
      let at = 0
      for (let end = 0; end < to; end++) {
        const c = text.charCodeAt(end)
        if (c !== 10 && c !== 13) continue
        lines.push(text.slice(at, end))
        if (c === 13 && end + 1 < to && text.charCodeAt(end + 1) === 10) end++
        at = end + 1
      }
      this.rest = text.slice(at)
    }
    return lines
  }

  /** The last line, when the text does not end with a line break. */
  end(): string[] {
    let rest = this.rest
    if (rest.endsWith('\r')) rest = rest.slice(0, -1)
    return rest !== '' ? [rest] : []
  }
}

/** The lines of a text stream in batches (one per chunk read), as TextLines splits them. */
export async function* fileLines(stream: AsyncIterable<string>): AsyncGenerator<string[]> {
  const split = new TextLines()
  for await (const chunk of stream) {
    const lines = split.push(chunk)
    if (lines.length > 0) yield lines
  }
  const last = split.end()
  if (last.length > 0) yield last
}

/** Lines of one chunk read, as bytes: line i is bytes[starts[i], ends[i]) (UTF-8, without its line break). */
export interface ByteLines {
  bytes: Buffer
  starts: number[]
  ends: number[]
}

/**
 * The lines of a byte stream of UTF-8 text in batches (one or two per chunk read), split as fileLines splits them.
 * While no carriage return has been seen, lines are cut at each \n byte (a \n byte is never inside a multi-byte
 * character) and handed on as bytes (ByteLines: the sizer reader reads a plain row from its bytes, and the rest
 * decoded as UTF-8); the line that straddles two chunks comes joined and decoded, as a batch of its own. No string of
 * the whole chunk is made. From the first carriage return on, the rest is decoded as a stream and split by
 * TextLines. (Decoding each 256 kB chunk to a string and slicing the lines from it made every later read of a line's
 * characters slower: 15 MB split and its numbers read took 600 ms against 300 ms from a Latin-1 string per line,
 * and 170–200 ms from the bytes, in a micro-benchmark at a load of 9.)
 */
export async function* fileLinesFromBytes(stream: AsyncIterable<Buffer>): AsyncGenerator<string[] | ByteLines> {
  let rest: Buffer | undefined
  let text: TextLines | undefined
  let decoder: StringDecoder | undefined
  for await (const chunk of stream) {
    if (!text && chunk.indexOf(13) >= 0) {
      text = new TextLines()
      decoder = new StringDecoder('utf8')
      if (rest) text.push(decoder.write(rest))
      rest = undefined
    }
    if (text) {
      const lines = text.push(decoder!.write(chunk))
      if (lines.length > 0) yield lines
      continue
    }
    let end = chunk.indexOf(10)
    let at = 0
    if (end >= 0 && rest) {
      yield [Buffer.concat([rest, chunk.subarray(0, end)]).toString('utf8')]
      rest = undefined
      at = end + 1
      end = chunk.indexOf(10, at)
    }
    if (end >= 0) {
      const lines: ByteLines = { bytes: chunk, starts: [], ends: [] }
      for (; end >= 0; end = chunk.indexOf(10, at)) {
        lines.starts.push(at)
        lines.ends.push(end)
        at = end + 1
      }
      yield lines
    }
    if (at < chunk.length) rest = rest ? Buffer.concat([rest, chunk.subarray(at)]) : Buffer.from(chunk.subarray(at))
  }
  if (text) {
    const lines = text.push(decoder!.end())
    lines.push(...text.end())
    if (lines.length > 0) yield lines
  } else if (rest && rest.length > 0) yield [rest.toString('utf8')]
}

/**
 * A file's bytes in chunks of at most `size`, each read into the same buffer: a chunk is valid until the next is
 * asked for (fileLinesFromBytes copies what it keeps across chunks, and the series pipeline reads each batch of lines
 * before it asks for the next). A new buffer per chunk, as a read stream gives, is memory the process touches for the
 * first time: on 20,000 rows (15 MB) about 1,500 more page faults and a 6 MB higher peak, which took 0.02–0.03 s here
 * (DEVELOPERS.md, the series pipeline). The reading starts at byte `start`; `bytesRead` counts the bytes given so
 * far; `close` ends the reading.
 */
export function fileChunks(path: string, size = 1 << 18, start = 0) {
  let handle: FileHandle | undefined
  let closed = false
  let position = start
  const buffer = Buffer.allocUnsafe(size)
  const chunks = {
    bytesRead: 0,
    async close(): Promise<void> {
      closed = true
      const h = handle
      handle = undefined
      await h?.close()
    },
    async *[Symbol.asyncIterator](): AsyncGenerator<Buffer> {
      if (closed) return
      handle = await open(path, 'r')
      try {
        for (;;) {
          const h = handle
          if (closed || !h) return
          const { bytesRead } = await h.read(buffer, 0, size, position)
          if (bytesRead === 0) return
          position += bytesRead
          chunks.bytesRead += bytesRead
          yield buffer.subarray(0, bytesRead)
        }
      } finally {
        await chunks.close()
      }
    }
  }
  return chunks
}

/**
 * A file's lines as fileLinesFromBytes gives them from fileChunks, able to jump ahead between batches: after
 * `skipTo(line)` the next batch is line `line`'s (its offset from `offsetOf`, a line index: shard.ts), the lines
 * before it neither read nor split. A series shard that starts deep in a long file skips so once the table is known.
 * `skipTo` returns false when no index was given. `bytesRead` counts the bytes skipped too.
 */
export function skippingFileLines(path: string, offsetOf?: (line: number) => Promise<number>) {
  let chunks = fileChunks(path)
  let target: number | undefined
  let skipped = 0
  return {
    get bytesRead(): number {
      return skipped + chunks.bytesRead
    },
    skipTo(line: number): boolean {
      if (!offsetOf) return false
      target = line
      return true
    },
    close: () => chunks.close(),
    async *[Symbol.asyncIterator](): AsyncGenerator<string[] | ByteLines> {
      let lines = fileLinesFromBytes(chunks)[Symbol.asyncIterator]()
      try {
        for (;;) {
          if (target !== undefined) {
            const offset = await offsetOf!(target)
            target = undefined
            await lines.return(undefined)
            chunks = fileChunks(path, undefined, offset)
            skipped = offset
            lines = fileLinesFromBytes(chunks)[Symbol.asyncIterator]()
          }
          const next = await lines.next()
          if (next.done) return
          yield next.value
        }
      } finally {
        await lines.return(undefined)
      }
    }
  }
}
