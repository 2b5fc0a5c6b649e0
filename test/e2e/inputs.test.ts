// End-to-end: what a person types into the editor's cells is what the study holds (a bare number in the unit the
// cell shows, thousands separators, percent signs), what cannot be read is refused with the reason at the field,
// and a bad or refused input is told the same way everywhere (header, result panel, charts, sample list, editor),
// in words the screen uses: no internal paths, no long digit strings.
import { mkdtemp, readFile, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { appSession } from './harness.ts'

let scratch: string
const session = appSession()

beforeAll(async () => {
  scratch = await mkdtemp(join(tmpdir(), 'motebench-e2e-inputs-'))
})

afterAll(async () => {
  if (scratch) await rm(scratch, { recursive: true, force: true })
})

async function openApp(opts: { wait?: boolean } = {}): Promise<Page> {
  const { page, errors } = await session.open(opts)
  expect(errors).toEqual([])
  // "save anyway?" where the study has problems: yes (the file shows what the model holds)
  page.on('dialog', (d) => void d.accept())
  return page
}

const cell = (page: Page, path: string) => page.locator(`[data-path="${path}"]`)

/** Types `text` into the field at `path` and leaves it (Tab), as a person would. */
async function type(page: Page, path: string, text: string): Promise<void> {
  await cell(page, path).fill(text)
  await cell(page, path).press('Tab')
}

/** The study as Save writes it (the web build downloads the file): what the model holds. */
async function saved(page: Page, name: string): Promise<{ samples: { size: { modes: Record<string, number>[] }; composition: { components: { volume_fraction: number }[] }; rh_percent: number }[] }> {
  const [d] = await Promise.all([page.waitForEvent('download'), page.getByTestId('save').click()])
  const file = join(scratch, name)
  await d.saveAs(file)
  return JSON.parse(await readFile(file, 'utf8'))
}

/** Every text a person reads about the problem: the editor's banner, the field messages, the notes and the header. */
async function messages(page: Page): Promise<string> {
  const parts = await page.locator('[data-testid="problems"], .field-error, [data-testid="stale-note"], [data-status], [data-testid="notice"]').allTextContents()
  return parts.join('\n')
}

/** No internal JSON path, and no number written with more digits than a person reads (7 or more in a row). */
function readable(text: string): void {
  expect(text).not.toMatch(/samples\[\d+\]|median_um|number_cm3|volume_fraction|\.size\.modes/)
  expect(text).not.toMatch(/\d{7,}/)
  expect(text).not.toMatch(/\d\.\d{6,}/)
}

const MEDIAN = 'samples[0].size.modes[0].median_um'
const AMOUNT = 'samples[0].size.modes[0].number_cm3'

describe('Typed values in the editor', { timeout: 120_000 }, () => {
  test('a bare number in the median cell is in the unit the cell shows; a typed unit is kept', async () => {
    const page = await openApp({ wait: false })
    const median = cell(page, MEDIAN)
    // the demo's Aitken mode: the cell shows 45 nm; "60" typed there is 60 nm
    expect(await median.inputValue()).toBe('45 nm')
    await type(page, MEDIAN, '60')
    expect(await median.inputValue()).toBe('60 nm')
    expect((await saved(page, 'sixty.mote')).samples[0].size.modes[0].median_um).toBeCloseTo(0.06, 12)

    // a unit typed with the number is read in it, and the cell then keeps that unit (not the number in another);
    // a bare number then means that unit
    await type(page, MEDIAN, '0.07 µm')
    expect(await median.inputValue()).toBe('0.07 µm')
    expect((await saved(page, 'seventy.mote')).samples[0].size.modes[0].median_um).toBeCloseTo(0.07, 12)
    await type(page, MEDIAN, '0.5')
    expect(await median.inputValue()).toBe('0.5 µm')
    expect((await saved(page, 'half.mote')).samples[0].size.modes[0].median_um).toBeCloseTo(0.5, 12)
    // a diameter that crosses 1 µm while typed in nm stays in nm (the unit does not switch under the typing)
    await type(page, MEDIAN, '80 nm')
    await type(page, MEDIAN, '1500')
    expect(await median.inputValue()).toBe('1500 nm')
    expect((await saved(page, 'crossed.mote')).samples[0].size.modes[0].median_um).toBeCloseTo(1.5, 12)
  })

  test('an amount shows its unit under the number; a bare number is in it, a typed unit is converted (1 m³ = 10⁶ cm³, common practice)', async () => {
    const page = await openApp({ wait: false })
    const unitOf = (path: string) => page.locator(`td.amount:has([data-path="${path}"]) .hint`)
    // the demo's Aitken mode is given by number: its cell says cm⁻³
    expect(await unitOf(AMOUNT).isVisible()).toBe(true)
    expect(await unitOf(AMOUNT).textContent()).toBe('cm⁻³')
    await type(page, AMOUNT, '6e9 m⁻³')
    expect(await cell(page, AMOUNT).inputValue()).toBe('6000')
    expect((await saved(page, 'per-m3.mote')).samples[0].size.modes[0].number_cm3).toBe(6000)
    // a mass typed per cubic metre in mg is not a number concentration: refused at the field, the model unchanged
    await type(page, AMOUNT, '0.14 mg/m3')
    const error = page.locator(`[data-error-for="${AMOUNT}"]`)
    await error.waitFor()
    expect(await error.textContent()).toMatch(/not a number concentration.*cm⁻³/)
    readable(await messages(page))
    expect((await saved(page, 'refused.mote')).samples[0].size.modes[0].number_cm3).toBe(6000)
  })

  test('"1e9 nm" is refused in nm, stays as typed, and the model keeps the last good value', async () => {
    const page = await openApp({ wait: false })
    await type(page, MEDIAN, '1e9 nm')
    const median = cell(page, MEDIAN)
    expect(await median.inputValue()).toBe('1e9 nm')
    expect(await median.getAttribute('aria-invalid')).toBe('true')
    const error = page.locator(`[data-error-for="${MEDIAN}"]`)
    await error.waitFor()
    const text = (await error.textContent()) ?? ''
    expect(text).toMatch(/median diameter/)
    expect(text).toMatch(/1\u202f000\u202f000 nm/) // the limit (1 mm) in the unit typed
    expect(text).not.toMatch(/µm/)
    readable(await messages(page))
    expect((await saved(page, 'kept.mote')).samples[0].size.modes[0].median_um).toBe(0.045)
  })

  test('"9,000" is 9000 particles per cm³; "1,5" is refused with the fix; "80 %" is 0.8 of the volume; RH takes "80%"', async () => {
    const page = await openApp({ wait: false })
    await type(page, AMOUNT, '9,000')
    expect(await cell(page, AMOUNT).inputValue()).toBe('9000')

    // the coastal sample's two components: 70 % and 30 % typed as 60 % and 40 %
    await page.locator('.sample-item[data-sample="Coastal haze day"] .sample-name').click()
    await type(page, 'samples[2].composition.components[0].volume_fraction', '60%')
    await type(page, 'samples[2].composition.components[1].volume_fraction', '40 %')
    await type(page, 'samples[2].rh_percent', '80%')
    expect(await cell(page, 'samples[2].composition.components[0].volume_fraction').inputValue()).toBe('0.6')
    expect(await cell(page, 'samples[2].rh_percent').inputValue()).toBe('80')
    const study = await saved(page, 'typed.mote')
    expect(study.samples[0].size.modes[0].number_cm3).toBe(9000)
    expect(study.samples[2].composition.components.map((c) => c.volume_fraction)).toEqual([0.6, 0.4])
    expect(study.samples[2].rh_percent).toBe(80)

    // a comma that may be a decimal mark is refused, with both readings offered; the model keeps 9000
    await page.locator('.sample-item[data-sample="Winter wood smoke"] .sample-name').click()
    await type(page, AMOUNT, '1,5')
    const error = page.locator(`[data-error-for="${AMOUNT}"]`)
    await error.waitFor()
    expect(await error.textContent()).toMatch(/number concentration: .*1\.5 or 15/)
    expect(await cell(page, AMOUNT).getAttribute('aria-invalid')).toBe('true')
    expect(await cell(page, AMOUNT).inputValue()).toBe('1,5')
    expect((await saved(page, 'refused.mote')).samples[0].size.modes[0].number_cm3).toBe(9000)
  })
})

describe('A bad input is told the same way everywhere', { timeout: 150_000 }, () => {
  test('a value out of range: the field, the header, the result panel, the size chart and the sample list all say stale', async () => {
    const page = await openApp()
    await page.locator('[data-status="ok"]').waitFor({ timeout: 90_000 })
    const gsd = 'samples[0].size.modes[1].gsd'
    await type(page, gsd, '0.9')
    // the field: marked, with its message (named as its column is)
    expect(await cell(page, gsd).getAttribute('aria-invalid')).toBe('true')
    expect(await cell(page, gsd).evaluate((e) => e.closest('.field')?.classList.contains('is-bad'))).toBe(true)
    expect(await page.locator(`[data-error-for="${gsd}"]`).first().textContent()).toMatch(/σg: .*greater than 1/)
    // the header, never "up to date" at the same time
    await page.locator('[data-status="stale"]').waitFor()
    expect(await page.locator('[data-status="ok"]').count()).toBe(0)
    // the result panel and the size chart
    await page.getByTestId('stale-note').waitFor()
    expect(await page.locator('#result-panel').getAttribute('data-fresh')).toBe('false')
    expect(await page.locator('[data-chart="size-distribution"]').getAttribute('class')).toMatch(/is-stale/)
    // the sample list's verdict
    const verdict = page.locator('.sample-item[data-sample="Winter wood smoke"] .verdict-mini')
    expect(await verdict.getAttribute('data-stale')).toBe('true')
    expect(await verdict.textContent()).toMatch(/stale/)
    // the editor's banner names the field as the screen does
    const banner = page.getByTestId('problems')
    expect(await banner.textContent()).toContain('Winter wood smoke › mode 2 › σg')
    readable(await messages(page))
    await page.screenshot({ path: join(scratch, 'bad-input.png') })
    if (process.env['MOTEBENCH_SHOTS']) await page.screenshot({ path: join(process.env['MOTEBENCH_SHOTS'], 'bad-input.png') })

    // fixed: every place says so again
    await type(page, gsd, '1.7')
    await page.locator('[data-status="ok"]').waitFor({ timeout: 90_000 })
    expect(await page.getByTestId('stale-note').count()).toBe(0)
    expect(await page.locator('[data-chart="size-distribution"]').getAttribute('class')).not.toMatch(/is-stale/)
    expect(await verdict.getAttribute('data-stale')).toBe('false')
    expect(await page.getByTestId('problems').count()).toBe(0)
  })

  test('inputs the computation refuses (an optical depth past the estimate): stale everywhere, in readable numbers', async () => {
    const page = await openApp()
    await page.locator('[data-status="ok"]').waitFor({ timeout: 90_000 })
    // 1e9 Aitken particles per cm³ in a layer of the demo's depth: an optical depth far above 10
    await type(page, AMOUNT, '1e9')
    await page.locator('[data-status="stale"]').waitFor({ timeout: 60_000 })
    expect(await page.locator('[data-status="stale"]').textContent()).toMatch(/Not computed · results stale/)
    expect(await page.locator('[data-status="stale"]').getAttribute('title')).toMatch(/“Winter wood smoke” could not be computed/)
    await page.getByTestId('stale-note').waitFor()
    expect(await page.getByTestId('stale-note').textContent()).toMatch(/Optical depth at 550 nm: [\d\u202f.]+ is outside 0–10/)
    expect(await page.getByTestId('problems').textContent()).toMatch(/Optical depth at 550 nm/)
    expect(await page.locator('.sample-item[data-sample="Winter wood smoke"] .verdict-mini').getAttribute('data-stale')).toBe('true')
    expect(await page.locator('[data-status="ok"]').count()).toBe(0)
    readable(await messages(page))
  })
})
