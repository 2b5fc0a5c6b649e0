// Exports: bytes and text written exactly, whole or not at all.
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { exportContent, writeExport } from '../../src-main/export-file.ts'

let dir: string
beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-export-'))
})
afterEach(async () => {
  await rm(dir, { recursive: true, force: true })
})

// The 8-byte PNG signature (PNG specification, section 5.2), then bytes that are not valid UTF-8.
const PNG_START = Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0xff, 0xfe, 0x00])

describe('exportContent', () => {
  it('decodes base64 to the very bytes it stands for', () => {
    const bytes = exportContent({ base64: Buffer.from(PNG_START).toString('base64') })
    expect(Buffer.compare(Buffer.from(bytes as Uint8Array), Buffer.from(PNG_START))).toBe(0)
  })

  it('passes text through', () => {
    expect(exportContent({ text: 'λ (nm),σext (Mm⁻¹)\n' })).toBe('λ (nm),σext (Mm⁻¹)\n')
  })

  it('refuses a request with no content, saying so', () => {
    expect(() => exportContent({})).toThrow(/text or as base64/)
  })
})

describe('writeExport', () => {
  it('writes bytes unchanged and text as UTF-8', async () => {
    await writeExport(join(dir, 'chart.png'), exportContent({ base64: Buffer.from(PNG_START).toString('base64') }))
    await writeExport(join(dir, 'results.csv'), 'ω,g\n0.92,0.61\n')
    expect(Buffer.compare(await readFile(join(dir, 'chart.png')), Buffer.from(PNG_START))).toBe(0)
    expect(await readFile(join(dir, 'results.csv'), 'utf8')).toBe('ω,g\n0.92,0.61\n')
  })

  it('replaces an existing export without a .bak or a temporary file left behind', async () => {
    const path = join(dir, 'results.csv')
    await writeFile(path, 'old')
    await writeExport(path, 'new')
    expect(await readFile(path, 'utf8')).toBe('new')
    expect(await readdir(dir)).toEqual(['results.csv'])
  })
})
