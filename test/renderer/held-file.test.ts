// A web page's instrument file is held as the file itself (campaign/held.ts): its length and sampled fingerprint,
// made from its bytes without decoding the whole text, must be those of the text the worker decodes, or a study
// saved on the web would report its files changed when the desktop reads them.
import { describe, expect, it } from 'vitest'
import { FINGERPRINT_SPAN, textFingerprint } from '../../src-core/index.ts'
import { holdFile } from '../../src-renderer/campaign/held.ts'

const rows = (n: number, extra = ''): string => {
  const lines = ['# units: Mm-1', `time,scattering 550 nm${extra}`]
  for (let i = 0; i < n; i++) lines.push(`2026-07-14T${String(Math.floor(i / 60) % 24).padStart(2, '0')}:${String(i % 60).padStart(2, '0')}:00Z,${(20 + (i % 7)).toFixed(1)}`)
  return lines.join('\n') + '\n'
}

describe('holding a file without its text', () => {
  it('gives an ASCII file the length, beginning and fingerprint of its text, from the bytes alone', async () => {
    // longer than two spans, so the fingerprint's head and tail are parts of the file; shorter, so they overlap
    for (const text of [rows(20_000), rows(10), '']) {
      const held = await holdFile({ name: 'neph.csv', blob: new Blob([text]) })
      expect(held.text).toBeUndefined()
      expect(held.blob).toBeDefined()
      expect(held.size).toBe(text.length)
      expect(held.head).toBe(text.slice(0, FINGERPRINT_SPAN))
      expect(held.fingerprint).toBe(textFingerprint(text))
    }
    expect(rows(20_000).length).toBeGreaterThan(2 * FINGERPRINT_SPAN)
  })

  it('decodes a file that is not plain ASCII (its length in characters is not its bytes) and keeps the text', async () => {
    const text = rows(20_000, ' µ') // 'µ' takes two bytes in UTF-8, one UTF-16 unit
    const held = await holdFile({ name: 'neph.csv', blob: new Blob([text]) })
    expect(held.text).toBe(text)
    expect(held.size).toBe(text.length)
    expect(held.fingerprint).toBe(textFingerprint(text))
  })

  it('keeps a text the desktop read with the fingerprint its host made', async () => {
    const text = rows(100)
    const held = await holdFile({ name: 'neph.csv', path: '/data/neph.csv', text, fingerprint: 'whole:0badf00d' })
    expect(held).toMatchObject({ text, size: text.length, fingerprint: 'whole:0badf00d', path: '/data/neph.csv' })
    expect((await holdFile({ name: 'neph.csv', text })).fingerprint).toBe(textFingerprint(text))
  })
})
