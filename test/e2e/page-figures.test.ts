// End-to-end: the figures the page shows are src-core's however its workers shared and ordered the work (the
// wavelengths split among the workers, quick passes left out for the samples not on
// screen and for an amount edit whose nodes the caches hold). The page's JSON export (numbers written in full by
// JSON.stringify) is compared with evaluateStudy of the exported study, computed here in one thread. Not to the bit:
// Chromium's and Node's JavaScript engines differ in the last bit of some Math functions (the humid sulfate's wet
// mass came out 349.2747318959969 in the page and …968 here), and a full pass after a quick pass differs from one
// without in the last bits (src-core's node cache; the layer's absorbed two-stream forcing, a difference of nearly
// equal fluxes of about 1e-5 W m⁻², by 4e-12 W m⁻²), so to 1e-9 relative or 1e-9 in the figure's unit; a figure
// from other work (a wavelength left out, the infrared bands on another grid, a pass stopped at another level)
// differs far more.
import { mkdtemp, readFile, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { evaluateStudy, type Study } from '../../src-core/index.ts'
import { appSession } from './harness.ts'

const session = appSession()
let scratch: string

beforeAll(async () => {
  scratch = await mkdtemp(join(tmpdir(), 'motebench-e2e-figures-'))
})
afterAll(async () => {
  if (scratch) await rm(scratch, { recursive: true, force: true })
})

/** The page's JSON export: the study and each sample's results. */
async function exported(page: Page, name: string): Promise<{ study: Study; results: Record<string, unknown>[] }> {
  const [d] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-json').click()])
  const path = join(scratch, name)
  await d.saveAs(path)
  return JSON.parse(await readFile(path, 'utf8'))
}

/** Each sample's results as the export writes them, from src-core in this thread. */
function reference(study: Study, indices: number[]): unknown[] {
  const { samples } = evaluateStudy(study, { sampleIndices: indices })
  return samples.map((r, k) => JSON.parse(JSON.stringify({ sample: study.samples[indices[k]].name, status: 'current', ...r })))
}

const RELATIVE = 1e-9
const ABSOLUTE = 1e-9

/**
 * Where `a` and `b` differ beyond RELATIVE (or ABSOLUTE) in a number (the count of Mie evaluations aside: it depends
 * on which worker computed what),  or at all in anything else (undefined: nowhere).
 */
function difference(a: unknown, b: unknown, at = ''): string | undefined {
  if (at.endsWith('mie_evaluations')) return undefined
  if (typeof a === 'number' && typeof b === 'number') return Math.abs(a - b) <= RELATIVE * Math.max(Math.abs(a), Math.abs(b)) + ABSOLUTE ? undefined : `${at}: ${a} against ${b}`
  if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') return Object.is(a, b) ? undefined : `${at}: ${JSON.stringify(a)} against ${JSON.stringify(b)}`
  const keys = new Set([...Object.keys(a), ...Object.keys(b)])
  for (const k of keys) {
    const d = difference((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${at}.${k}`)
    if (d) return d
  }
  return undefined
}

describe('the page’s figures', { timeout: 300_000 }, () => {
  test('every demo sample after opening, and the dust sample after an amount edit, equal src-core’s (to 1e-9)', async () => {
    const { page } = await session.open({ wait: false })
    await page.locator('[data-status="ok"]').waitFor({ timeout: 240_000 })
    const opened = await exported(page, 'opened.json')
    expect(opened.results.map((r) => r.sample)).toEqual(opened.study.samples.map((s) => s.name))
    expect(difference(opened.results, reference(opened.study, opened.study.samples.map((_, i) => i)))).toBeUndefined()

    // an amount edit of the dust sample (its full pass from the node caches, without a quick pass first)
    const dust = opened.study.samples.findIndex((s) => /dust/i.test(s.name))
    await page.locator(`.sample-item[data-sample="${opened.study.samples[dust].name}"] button.sample-name`).click()
    const modes = opened.study.samples[dust].size
    expect(modes.kind).toBe('modes')
    const last = modes.kind === 'modes' ? modes.modes.length - 1 : 0
    const amount = page.locator(`[data-path^="samples[${dust}].size.modes[${last}]."][data-path$="_cm3"], [data-path^="samples[${dust}].size.modes[${last}]."][data-path$="_m3"]`).first()
    const old = await amount.inputValue()
    await amount.fill(old.replace(/^\s*([0-9.eE+-]+)/, (_, n: string) => String(Number(n) * 1.5)))
    await page.locator('[data-status="busy"]').waitFor({ timeout: 10_000 }).catch(() => {})
    await page.locator('[data-status="ok"]').waitFor({ timeout: 120_000 })
    const edited = await exported(page, 'edited.json')
    expect(edited.study.samples[dust]).not.toEqual(opened.study.samples[dust])
    expect(difference(edited.results[dust], reference(edited.study, [dust])[0])).toBeUndefined()
    expect(difference(edited.results[dust], opened.results[dust])).toMatch(/ext/)
  })
})
