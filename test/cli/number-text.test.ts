// The command line's fast number text (sevenDigits) against the expression it replaces, String(Number(v.toPrecision(7))),
// and the series command's line splitting (fileLines) against node:readline's: faster paths that must give the
// same text (the CSV output must not change by a character).
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { createInterface } from 'node:readline'
import { Readable } from 'node:stream'
import { describe, expect, it } from 'vitest'
import { sevenDigits, writeSevenDigits } from '../../src-main/cli/number-text.ts'
import { fileChunks, fileLines, fileLinesFromBytes } from '../../src-main/cli/file-lines.ts'

const reference = (v: number) => String(Number(v.toPrecision(7)))

describe('sevenDigits', () => {
  it('writes what String(Number(v.toPrecision(7))) writes, for random doubles of every magnitude, ties and edge cases (as a string, and as bytes by writeSevenDigits)', () => {
    const mismatches: string[] = []
    const bytes = new Uint8Array(64)
    const check = (v: number) => {
      const got = sevenDigits(v)
      if (got !== reference(v) && mismatches.length < 5) mismatches.push(`${v}: ${got} vs ${reference(v)}`)
      const end = writeSevenDigits(v, bytes, 3)
      const written = Buffer.from(bytes.subarray(3, end)).toString('latin1')
      if (written !== reference(v) && mismatches.length < 5) mismatches.push(`${v}: ${written} (bytes) vs ${reference(v)}`)
    }
    // a fixed pseudo-random sequence (xorshift), so a failure repeats
    let x = 0x9e3779b9
    const next = () => ((x ^= x << 13), (x ^= x >>> 17), (x ^= x << 5), (x >>> 0) / 2 ** 32)
    const bits = new Float64Array(1)
    const words = new Uint32Array(bits.buffer)
    for (let i = 0; i < 100_000; i++) {
      words[0] = next() * 2 ** 32
      words[1] = next() * 2 ** 32
      if (Number.isFinite(bits[0])) check(bits[0]) // any double, denormals included
      check((next() - 0.3) * 10 ** Math.floor(next() * 50 - 25))
    }
    for (let i = 0; i < 20_000; i++) {
      check(i)
      check(i / 1000)
      check(12345675 + 10 * i) // exact ties at the 8th digit (rounded away from zero)
      check(-(12345675 + 10 * i))
      check((1234567 + i) / 1e6 + 5e-8) // near ties
    }
    // around every power of ten the writer takes (its decimal exponent comes from the binary one, then one step)
    const up = (v: number) => ((bits[0] = v), words[0] === 0xffffffff ? (words[0] = 0, words[1]++) : words[0]++, bits[0])
    const down = (v: number) => ((bits[0] = v), words[0] === 0 ? (words[0] = 0xffffffff, words[1]--) : words[0]--, bits[0])
    for (let k = -17; k <= 29; k++) {
      const p = Number(`1e${k}`)
      for (const v of [p, up(p), down(p), up(up(p)), down(down(p)), 2 * p, p / 2, 9.9999995 * p, 9.99999949 * p]) check(v), check(-v)
    }
    for (const v of [1, 10, 1e6, 1e7, 9999999.5, 999999.95, 0.1, 1e21, 1e22, 1.5e-7, 1e-6, 9.9999995e-7, 5e-324, 2.2e-308, Number.MAX_VALUE, -0, 0.5, 1.2345675, 1e28, 1e-16]) check(v)
    expect(mismatches).toEqual([])
  })
})

describe('fileLines', () => {
  /** Checks that fileLines, fed `text` in chunks of each size, gives the lines node:readline gives; returns those lines. */
  async function sameLinesAsReadline(text: string, sizes: number[]): Promise<string[]> {
    const viaReadline: string[] = []
    for await (const l of createInterface({ input: Readable.from([text]), crlfDelay: Infinity })) viaReadline.push(l)
    for (const size of sizes) {
      const chunks: string[] = []
      for (let i = 0; i < text.length; i += size) chunks.push(text.slice(i, i + size))
      const ours: string[] = []
      for await (const batch of fileLines(Readable.from(chunks))) ours.push(...batch)
      expect(ours, `chunks of ${size}`).toEqual(viaReadline)
      // the same from the UTF-8 bytes, cut anywhere (inside a character too)
      const bytes = Buffer.from(text, 'utf8')
      const pieces: Buffer[] = []
      for (let i = 0; i < bytes.length; i += size) pieces.push(bytes.subarray(i, i + size))
      const fromBytes: string[] = []
      for await (const batch of fileLinesFromBytes(Readable.from(pieces))) {
        if (Array.isArray(batch)) fromBytes.push(...batch)
        else for (let i = 0; i < batch.starts.length; i++) fromBytes.push(batch.bytes.toString('utf8', batch.starts[i], batch.ends[i]))
      }
      expect(fromBytes, `byte chunks of ${size}`).toEqual(viaReadline)
    }
    return viaReadline
  }

  it('splits text into the lines node:readline gives, whatever the chunks (\\n, \\r\\n, a lone \\r, blank lines, no final break)', async () => {
    const text = 'units: nm\r\nquantity: dN\r\n\r\ntime,10,20\n2024-01-01,1,2\r2024-01-02,3,4\r\n\n\n2024-01-03,5,6\r\nlast,7,8'
    expect(await sameLinesAsReadline(text, [1, 2, 3, 5, 7, 1000])).toHaveLength(10)
  })

  it('gives the same lines for a file without carriage returns (lines sliced from each chunk, joined across chunks)', async () => {
    const text = 'units: nm\n\ntime,10,20\n2024-01-01T00:00:00Z,1,2\n2024-01-01T00:01:00Z,3,4\n\nlast,5,6\n'
    expect(await sameLinesAsReadline(text, [1, 2, 3, 5, 7, 11, 1000])).toHaveLength(7)
  })

  it('gives the same lines from a file read into one buffer again and again (fileChunks), each batch read before the next', async () => {
    const text = '\ufeffunits: µm\ntime,0.01 µm,0.02 µm\n' + Array.from({ length: 40 }, (_, i) => `2024-01-01T00:${String(i).padStart(2, '0')}:00Z,${i},${2 * i}`).join('\n') + '\nnoté,3,4\r\nlast ü'
    const viaReadline: string[] = []
    for await (const l of createInterface({ input: Readable.from([text]), crlfDelay: Infinity })) viaReadline.push(l)
    const dir = mkdtempSync(join(tmpdir(), 'motebench-chunks-'))
    try {
      const path = join(dir, 'sizer.csv')
      writeFileSync(path, text)
      for (const size of [1, 2, 3, 7, 64, 100_000]) {
        const chunks = fileChunks(path, size)
        const lines: string[] = []
        for await (const batch of fileLinesFromBytes(chunks)) {
          if (Array.isArray(batch)) lines.push(...batch)
          else for (let i = 0; i < batch.starts.length; i++) lines.push(batch.bytes.toString('utf8', batch.starts[i], batch.ends[i]))
        }
        expect(lines, `chunks of ${size}`).toEqual(viaReadline)
        expect(chunks.bytesRead).toBe(Buffer.byteLength(text))
      }
      // closed before the end: no further chunk
      const chunks = fileChunks(path, 8)
      let seen = 0
      for await (const c of chunks) {
        seen += c.length
        await chunks.close()
      }
      expect(seen).toBe(8)
    } finally {
      rmSync(dir, { recursive: true, force: true })
    }
  })

  it('gives the same lines for text beyond ASCII (a byte-order mark, µm, a carriage return after such lines)', async () => {
    const text = '\ufeffunits: µm\ntime,0.01 µm,0.02 µm\n2024-01-01T00:00:00Z,1,2\nnoté,3,4\n2024-01-01T00:02:00Z,5,6\r\nlast ü'
    expect(await sameLinesAsReadline(text, [1, 2, 3, 5, 7, 11, 1000])).toHaveLength(6)
    const plain = 'a,b\nµ\n\nc'
    expect(await sameLinesAsReadline(plain, [1, 2, 3, 100])).toHaveLength(4)
  })
})
