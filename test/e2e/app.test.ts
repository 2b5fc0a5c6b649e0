// End-to-end: the web build of the app in headless Chromium, served from 127.0.0.1 by the test itself.
// Run by `npm test` (vitest). Fails with a clear message where Chromium is missing.
import { readdirSync } from 'node:fs'
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { appSession, isLocal, ROOT, shownNumber } from './harness.ts'
import { findClipped } from './clipping.ts'

let scratch: string
const session = appSession()
const requests = session.requests

beforeAll(async () => {
  scratch = await mkdtemp(join(tmpdir(), 'motebench-e2e-files-'))
})

afterAll(async () => {
  if (scratch) await rm(scratch, { recursive: true, force: true })
})

/** A fresh browser profile with the app open on the demo study (results of the selected sample computed unless `wait` is false). */
async function openApp(opts: { keepCautions?: boolean; wait?: boolean } = {}): Promise<Page> {
  const { page, errors } = await session.open(opts)
  expect(errors).toEqual([])
  return page
}

/** The samples on screen (the selected one, or the compared ones) have results from their current inputs. */
async function waitForResults(page: Page): Promise<void> {
  await page.locator('#result-panel[data-fresh="true"]').waitFor({ timeout: 60_000 })
}

async function sigmaExt550(page: Page): Promise<number> {
  const cell = page.locator('[data-testid="optics-table"] tr[data-wavelength="550"] td[data-col="σext"]')
  return shownNumber(await cell.textContent())
}

async function chooseFile(page: Page, click: () => Promise<void>, path: string): Promise<void> {
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), click()])
  await chooser.setFiles(path)
}

describe('Motebench in the browser', { timeout: 90_000 }, () => {
  test('first start shows the cautions; the demo study opens with results', async () => {
    const page = await openApp({ keepCautions: true })
    const dialog = page.locator('[data-dialog="cautions"]')
    await expect.poll(() => dialog.isVisible()).toBe(true)
    const text = await dialog.textContent()
    expect(text).toMatch(/crystalline silica/i)
    expect(text).toMatch(/respirat/i)
    expect(text).toMatch(/not a climate projection/i)
    await page.getByTestId('cautions-ok').click()
    await page.locator('[data-status="ok"]').waitFor({ timeout: 80_000 }) // every sample computed
    expect(await page.locator('.sample-item').count()).toBe(5)
    expect(await page.locator('.verdict-mini').count()).toBe(5)
    expect(await page.locator('[data-testid="optics-table"] tbody tr').count()).toBe(13)
    expect(await sigmaExt550(page)).toBeGreaterThan(0)
    await page.locator('[data-tab="climate"]').click()
    expect(await page.getByTestId('verdict').getAttribute('data-verdict')).toMatch(/cools|warms|too close to call/)
  })

  test('a larger accumulation-mode diameter at fixed number raises σext at 550 nm, and the charts follow', async () => {
    const page = await openApp()
    const before = await sigmaExt550(page)
    const picture = (chart: string) => page.locator(`[data-chart="${chart}"] canvas`).first().screenshot()
    const sizesBefore = await picture('size-distribution')
    const spectrumBefore = await picture('extinction-spectrum')
    await page.locator('[data-path="samples[0].size.modes[1].median_um"]').fill('200 nm')
    await expect.poll(() => sigmaExt550(page), { timeout: 60_000 }).not.toBe(before)
    await waitForResults(page)
    expect(await sigmaExt550(page)).toBeGreaterThan(before)
    // the size distribution and the extinction spectrum are drawn again from the new inputs
    await expect.poll(async () => (await picture('size-distribution')).equals(sizesBefore), { timeout: 10_000 }).toBe(false)
    expect((await picture('extinction-spectrum')).equals(spectrumBefore)).toBe(false)
  })

  test('a bad value is marked at its field and the last result stays, marked stale', async () => {
    const page = await openApp()
    const before = await sigmaExt550(page)
    const gsd = page.locator('[data-path="samples[0].size.modes[1].gsd"]')
    await gsd.fill('0.9')
    const err = page.locator('[data-error-for="samples[0].size.modes[1].gsd"]').first()
    await err.waitFor()
    expect(await err.textContent()).toMatch(/greater than 1/)
    await page.getByTestId('stale-note').waitFor()
    await page.locator('[data-status="stale"]').waitFor()
    expect(await sigmaExt550(page)).toBe(before)

    const median = page.locator('[data-path="samples[0].size.modes[1].median_um"]')
    await median.fill('twelve')
    await page.locator('[data-error-for="samples[0].size.modes[1].median_um"]').waitFor()
    expect(await sigmaExt550(page)).toBe(before)

    await median.fill('130 nm')
    await gsd.fill('1.7')
    await waitForResults(page)
    expect(await page.getByTestId('stale-note').count()).toBe(0)
    expect(await sigmaExt550(page)).toBe(before)
  })

  const sizerFiles = readdirSync(join(ROOT, 'resources')).filter((f) => /^sizer-.*\.(csv|tsv|txt)$/.test(f))

  test.each(sizerFiles)('importing %s gives a sample with measured bins and results', async (name) => {
    const page = await openApp({ wait: false })
    await chooseFile(page, () => page.getByTestId('import-sizer').click(), join(ROOT, 'resources', name))
    await page.getByTestId('sizer-apply').click()
    await page.getByTestId('bins-panel').waitFor()
    expect(await page.locator('.sample-item').count()).toBe(6)
    await waitForResults(page)
    expect(await sigmaExt550(page)).toBeGreaterThan(0)
  })

  test('a sizer file dropped on the window is imported like one chosen from the menu', async () => {
    const page = await openApp({ wait: false })
    const text = await readFile(join(ROOT, 'resources', 'sizer-single-comma.csv'), 'utf8')
    // a drop event carrying the file, as the browser makes it when a file is dragged onto the page
    const transfer = await page.evaluateHandle((t) => {
      const dt = new DataTransfer()
      dt.items.add(new File([t], 'sizer-single-comma.csv', { type: 'text/csv' }))
      return dt
    }, text)
    await page.locator('.app').dispatchEvent('dragover', { dataTransfer: transfer })
    await page.locator('.app').dispatchEvent('drop', { dataTransfer: transfer })
    await page.getByTestId('sizer-apply').click()
    await page.getByTestId('bins-panel').waitFor()
    expect(await page.locator('.sample-item').count()).toBe(6)
  })

  test('a broken sizer file is refused with its line number', async () => {
    const page = await openApp({ wait: false })
    const good = await readFile(join(ROOT, 'resources', 'sizer-single-comma.csv'), 'utf8')
    const lines = good.split('\n')
    const k = lines.findIndex((l) => l.startsWith('0.1105'))
    lines[k] = '0.1105,lots'
    const path = join(scratch, 'sizer-broken.csv')
    await writeFile(path, lines.join('\n'))
    await chooseFile(page, () => page.getByTestId('import-sizer').click(), path)
    const notice = page.getByTestId('notice')
    await notice.waitFor()
    expect(await notice.textContent()).toContain(`line ${k + 1}`)
    expect(await notice.textContent()).toMatch(/not imported/)
    expect(await page.locator('.sample-item').count()).toBe(5)
  })

  test('after an unclean close, the recovery copy is offered and restores the unsaved edit', async () => {
    const page = await openApp({ wait: false })
    await page.getByTestId('sample-name').fill('Edited before a crash')
    // the copy is written shortly after each edit while there are unsaved changes
    await expect.poll(() => page.evaluate(() => localStorage.getItem('motebench.recovery') ?? ''), { timeout: 40_000 }).toContain('Edited before a crash')
    // reopen the page as after a crash (no save, no clean close): the app offers the copy, and restores it on request
    await page.evaluate(() => (window.onbeforeunload = null))
    await page.reload()
    await page.getByTestId('recovery-offer').waitFor({ timeout: 30_000 })
    expect(await page.getByTestId('recovery-offer').textContent()).toMatch(/Unsaved work was found/)
    await page.getByTestId('recovery-restore').click()
    await page.locator('.sample-item[data-sample="Edited before a crash"]').waitFor({ timeout: 30_000 })
  })

  test('saving and reopening gives the same study', async () => {
    const page = await openApp({ wait: false })
    await page.getByTestId('sample-name').fill('Renamed wood smoke')
    const [first] = await Promise.all([page.waitForEvent('download'), page.getByTestId('save').click()])
    const saved = join(scratch, 'saved.mote')
    await first.saveAs(saved)
    const text = await readFile(saved, 'utf8')
    expect(text).toContain('Renamed wood smoke')

    const again = await openApp({ wait: false })
    await chooseFile(again, () => again.getByTestId('open').click(), saved)
    await again.locator('.sample-item[data-sample="Renamed wood smoke"]').waitFor()
    const [second] = await Promise.all([again.waitForEvent('download'), again.getByTestId('save').click()])
    const resaved = join(scratch, 'resaved.mote')
    await second.saveAs(resaved)
    expect(await readFile(resaved, 'utf8')).toBe(text)
  })

  test('results export as CSV and JSON, and a chart as a PNG picture', async () => {
    const page = await openApp()
    const sigma = await sigmaExt550(page)
    const download = async (click: () => Promise<void>, name: string) => {
      const [d] = await Promise.all([page.waitForEvent('download'), click()])
      const path = join(scratch, name)
      await d.saveAs(path)
      return readFile(path)
    }
    // CSV: a header row naming units, and the 550 nm σext of the selected sample as the table shows it
    const csv = (await download(() => page.getByTestId('export-csv').click(), 'results.csv')).toString('utf8')
    const lines = csv.trim().split(/\r?\n/)
    expect(lines[0]).toMatch(/Mm/)
    expect(lines.length).toBeGreaterThan(13)
    const header = lines[0].split(',')
    const extCol = header.findIndex((h) => /ext/i.test(h) && /Mm/.test(h))
    const wlCol = header.findIndex((h) => /wavelength/i.test(h))
    expect(extCol).toBeGreaterThanOrEqual(0)
    const row550 = lines.find((l) => l.split(',')[wlCol] === '550')
    expect(row550).toBeDefined()
    expect(Math.abs(Number(row550!.split(',')[extCol]) - sigma) / sigma).toBeLessThan(1e-3)
    // JSON: parses, and holds the study and its results
    const json = JSON.parse((await download(() => page.getByTestId('export-json').click(), 'results.json')).toString('utf8'))
    expect(JSON.stringify(json)).toContain('Winter wood smoke')
    // PNG: the file starts with the PNG signature (ISO/IEC 15948)
    const png = await download(() => page.locator('figure.chart button', { hasText: 'PNG' }).first().click(), 'chart.png')
    expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])

    // every row says how its figures stand to the inputs: current here; out of date once an input of the sample
    // cannot be read (the last good figures stay on screen, and an export of them says so, in the file and at once)
    const statusCol = header.indexOf('status')
    expect(row550!.split(',')[statusCol]).toBe('current')
    expect(json.results[0].status).toBe('current')
    await page.locator('[data-path="samples[0].size.modes[1].gsd"]').fill('0.9')
    await page.locator('[data-error-for="samples[0].size.modes[1].gsd"]').first().waitFor()
    const staleCsv = (await download(() => page.getByTestId('export-csv').click(), 'stale.csv')).toString('utf8')
    const staleRow = staleCsv.split('\n').find((l) => l.startsWith('Winter wood smoke,') && l.split(',')[wlCol] === '550')
    expect(staleRow!.split(',')[statusCol]).toBe('out-of-date')
    expect(Number(staleRow!.split(',')[extCol])).toBe(Number(row550!.split(',')[extCol]))
    expect(staleCsv).toMatch(/# Not from the current inputs: “Winter wood smoke”: out of date/)
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/not from the current inputs/)
    const staleJson = JSON.parse((await download(() => page.getByTestId('export-json').click(), 'stale.json')).toString('utf8'))
    expect(staleJson.results[0].status).toBe('out-of-date')
  })

  test('compare: two marked samples overlay in the charts and sit side by side in one table', async () => {
    const page = await openApp({ wait: false })
    const toggles = page.getByTestId('compare-toggle')
    await toggles.nth(0).check()
    await toggles.nth(2).check()
    await waitForResults(page)
    const legend = page.locator('[data-chart="extinction-spectrum"] .u-legend')
    expect(await legend.locator('.u-series').count()).toBe(2)
    expect(await legend.textContent()).toContain('Winter wood smoke')
    expect(await legend.textContent()).toContain('Coastal haze day')
    expect(await page.locator('[data-chart="ssa-spectrum"] .u-legend .u-series').count()).toBe(2)
    // every chart of every result view, and the size plot, draws both samples
    for (const view of ['optics', 'angles', 'humidity', 'climate']) {
      await page.locator(`[data-tab="${view}"]`).click()
      await page.locator(`[data-view="${view}"] [data-chart]`).first().waitFor({ timeout: 60_000 })
      const words = page.locator('[data-chart] [data-chart-axes]')
      expect(await words.count()).toBeGreaterThanOrEqual(view === 'optics' ? 4 : 2)
      // (a sample's f(RH) curve may still be coming: the view names it until it does)
      await expect.poll(async () => (await words.allTextContents()).every((w) => /Winter wood smoke.*Coastal haze day/.test(w)), { timeout: 60_000 }).toBe(true)
    }
    await page.locator('[data-tab="compare"]').click()
    const heads = page.locator('[data-testid="compare-table"] thead th[data-sample]')
    expect(await heads.count()).toBe(2)
    expect(await heads.nth(1).textContent()).toContain('Coastal haze day')
    expect(await page.locator('[data-testid="compare-table"] .diff').count()).toBeGreaterThan(5)
  })

  test('a slow change shows quick figures first, marked as such, then the full ones within the stated 1 %', async () => {
    const page = await openApp()
    // the coastal sample's humid sea-salt coarse mode: a humidity change makes every Mie evaluation new
    await page.locator('.sample-item[data-sample="Coastal haze day"] button.sample-name').click()
    await waitForResults(page)
    const index = await page.locator('.sample-item').evaluateAll((els) => els.findIndex((e) => (e as HTMLElement).dataset.sample === 'Coastal haze day'))
    await page.locator(`[data-path="samples[${index}].rh_percent"]`).fill('79')
    await page.locator('#result-panel[data-preview="true"]').waitFor({ timeout: 60_000 })
    const note = await page.getByTestId('preview-note').textContent()
    expect(note).toMatch(/quick first pass/)
    const quick = await sigmaExt550(page)
    await waitForResults(page)
    expect(await page.getByTestId('preview-note').count()).toBe(0)
    const full = await sigmaExt550(page)
    expect(Math.abs(quick - full) / full).toBeLessThan(0.01)
  })

  test('a refinement stopped by the user keeps the quick figures, says so, and the next edit finishes it', async () => {
    const page = await openApp()
    await page.locator('.sample-item[data-sample="Coastal haze day"] button.sample-name').click()
    await waitForResults(page)
    const index = await page.locator('.sample-item').evaluateAll((els) => els.findIndex((e) => (e as HTMLElement).dataset.sample === 'Coastal haze day'))
    // the coastal sample's full pass after a humidity change takes over a second: time to stop it
    await page.locator(`[data-path="samples[${index}].rh_percent"]`).fill('77')
    await page.locator('#result-panel[data-preview="true"]').waitFor({ timeout: 60_000 })
    await page.locator('[data-status="busy"] button', { hasText: 'Stop' }).click()
    await expect.poll(() => page.getByTestId('preview-note').textContent()).toMatch(/was stopped/)
    expect(await page.locator('[data-status="busy"]').count()).toBe(0)
    expect(await page.locator('#result-panel').getAttribute('data-fresh')).toBe('false')
    // an edit of another sample starts a job that also finishes this one
    await page.locator('.sample-item').first().locator('button.sample-name').click()
    await page.locator('[data-path="samples[0].rh_percent"]').fill('61')
    await waitForResults(page)
    await page.locator('.sample-item[data-sample="Coastal haze day"] button.sample-name').click()
    await waitForResults(page)
    expect(await page.getByTestId('preview-note').count()).toBe(0)
  })

  test('the verdict flips when ω is pushed below ω_crit (more black carbon)', async () => {
    const page = await openApp()
    await page.locator('[data-tab="climate"]').click()
    const verdict = page.getByTestId('verdict')
    const before = await verdict.getAttribute('data-verdict')
    expect(before).toBe('cools')
    // Winter wood smoke: organic matter / brown carbon / black carbon → mostly black carbon.
    await page.locator('[data-path="samples[0].composition.components[0].volume_fraction"]').fill('0.2')
    await page.locator('[data-path="samples[0].composition.components[2].volume_fraction"]').fill('0.66')
    await waitForResults(page)
    await expect.poll(() => verdict.getAttribute('data-verdict'), { timeout: 60_000 }).toBe('warms')
    const [ssa, crit] = ((await page.getByTestId('ssa-vs-crit').textContent()) ?? '').split(/[<>=]/).map((t) => shownNumber(t))
    expect(ssa).toBeLessThan(crit)
  })

  test("the study's wavelengths and the verdict's margin are edited in place", async () => {
    const page = await openApp()
    const rows = page.locator('[data-testid="optics-table"] tbody tr')
    const field = page.locator('[data-path="wavelengths_nm"]')
    // a list out of order is refused at the field and the last good table stays
    await field.fill('550, 450')
    await expect.poll(() => page.locator('[data-error-for="wavelengths_nm"]').textContent()).toMatch(/ascending/)
    expect(await rows.count()).toBe(13)
    await field.fill('450, 550, 700')
    await expect.poll(() => rows.count(), { timeout: 60_000 }).toBe(3)
    // a margin larger than this forcing (about 1 W m⁻²) makes the verdict "too close to call" (|ΔF| < margin)
    await page.locator('[data-tab="climate"]').click()
    await page.locator('[data-path="verdict_margin_w_m2"]').fill('100')
    await expect.poll(() => page.getByTestId('verdict').getAttribute('data-verdict'), { timeout: 60_000 }).toBe('too close to call')
  })

  test('by keyboard alone: choose, reorder, add, duplicate, delete and undo samples, mark two to compare, edit a value, switch views', async () => {
    const page = await openApp()
    const names = () => page.locator('.sample-item').evaluateAll((li) => li.map((x) => x.getAttribute('data-sample')))
    const selected = () => page.locator('.sample-item.is-selected').getAttribute('data-sample')
    /** Moves the focus with Tab (Shift+Tab when `back`) until it is on an element matching `selector`. */
    const tabTo = async (selector: string, back = false) => {
      for (let i = 0; i < 300; i++) {
        if (await page.evaluate((sel) => document.activeElement?.matches(sel) ?? false, selector)) return
        await page.keyboard.press(back ? 'Shift+Tab' : 'Tab')
      }
      throw new Error(`Tab never reached ${selector}`)
    }
    const first = await names()
    expect(first.length).toBe(5)

    // choose the third sample; the focus ring is drawn where the focus is
    await tabTo(`.sample-item[data-sample="${first[2]}"] button.sample-name`)
    expect(await page.evaluate(() => getComputedStyle(document.activeElement!).outlineStyle)).toBe('solid')
    await page.keyboard.press('Enter')
    expect(await selected()).toBe(first[2])
    // Alt+↓ moves it down one place; Ctrl+Z (outside a text field) puts it back
    await page.keyboard.press('Alt+ArrowDown')
    expect(await names()).toEqual([first[0], first[1], first[3], first[2], first[4]])
    await page.keyboard.press('Control+z')
    expect(await names()).toEqual(first)

    // add, then duplicate the new sample, then delete the copy and undo the deletion from the message
    await tabTo('[data-testid="add-sample"]')
    await page.keyboard.press('Enter')
    expect((await names()).length).toBe(6)
    const added = await selected()
    await tabTo('[data-testid="duplicate-sample"]')
    await page.keyboard.press('Enter')
    expect(await selected()).toBe(`${added} (copy)`)
    expect((await names()).length).toBe(7)
    await tabTo('[data-testid="delete-sample"]')
    await page.keyboard.press('Enter')
    expect(await names()).toEqual([...first, added])
    await tabTo('[data-testid="toast-undo"]')
    await page.keyboard.press('Enter')
    expect(await names()).toEqual([...first, added, `${added} (copy)`])

    // rename the selected sample by typing in its name field
    await tabTo('[data-testid="sample-name"]')
    await page.keyboard.press('Control+a')
    await page.keyboard.type('Typed name')
    await expect.poll(() => selected()).toBe('Typed name')

    // a value typed with its unit in a mode's field changes the figures
    await tabTo(`.sample-item[data-sample="${first[0]}"] button.sample-name`, true)
    await page.keyboard.press('Enter')
    await page.keyboard.press('Alt+1')
    await waitForResults(page)
    const before = await sigmaExt550(page)
    await tabTo('[data-path="samples[0].size.modes[1].median_um"]')
    await page.keyboard.press('Control+a')
    await page.keyboard.type('200 nm')
    await expect.poll(() => sigmaExt550(page), { timeout: 60_000 }).toBeGreaterThan(before)
    // mark the first two samples with Space and switch to the side-by-side view with Alt+5
    await tabTo(`.sample-item[data-sample="${first[0]}"] [data-testid="compare-toggle"]`, true)
    await page.keyboard.press('Space')
    await tabTo(`.sample-item[data-sample="${first[1]}"] [data-testid="compare-toggle"]`)
    await page.keyboard.press('Space')
    expect(await page.locator('.sample-item input:checked').count()).toBe(2)
    expect(await page.locator('[data-tab="compare"]').textContent()).toMatch(/\(2\)/)
    await page.keyboard.press('Alt+5')
    expect(await page.locator('#result-panel').getAttribute('data-current')).toBe('compare')
    // the arrow keys move between the result views once a tab has the focus
    await tabTo('[role="tab"][aria-selected="true"]')
    await page.keyboard.press('ArrowLeft')
    expect(await page.locator('#result-panel').getAttribute('data-current')).toBe('climate')

  })

  test('the size plot, scattering angles, f(RH) and climate views show what they say they show', async () => {
    const page = await openApp()
    const axes = (chart: string) => page.locator(`[data-chart="${chart}"] [data-chart-axes]`).textContent()

    // on a 1366 × 768 screen every view fits the width (all nine views fit 1366 px): the page never scrolls sideways, and the samples, the
    // inputs and the results sit side by side within the window
    for (let k = 1; k <= 9; k++) {
      await page.keyboard.press(`Alt+${k}`)
      await page.locator('#result-panel').waitFor()
      const fit = await page.evaluate(() => ({
        page: document.documentElement.scrollWidth,
        window: window.innerWidth,
        columns: ['.samples', '.editor', '.results'].map((c) => document.querySelector(c)?.getBoundingClientRect().right ?? Infinity)
      }))
      expect(fit.window).toBe(1366)
      expect(fit.page, `view ${k}`).toBeLessThanOrEqual(fit.window)
      for (const right of fit.columns) expect(right, `view ${k}`).toBeLessThanOrEqual(fit.window)
      // and inside the window every table and control lies within its box: no button, field text or column cut
      // off, and a table wider than its box scrolls with its cue shown (test/e2e/clipping.ts)
      expect(await findClipped(page), `view ${k}`).toEqual([])
    }
    await page.keyboard.press('Alt+1')
    // and with each demo sample chosen (long component names, a mode with its own composition, wide tables)
    const items = page.locator('.sample-item')
    for (let i = 0; i < (await items.count()); i++) {
      await items.nth(i).click()
      await page.locator('section.editor[aria-label]').waitFor()
      expect(await findClipped(page), `sample ${i + 1}`).toEqual([])
    }
    await items.first().click()

    // the size distribution as number, then as volume: the axis and the drawing change
    expect(await axes('size-distribution')).toMatch(/^dN\/dlogDp .* against Dry diameter Dp \(µm\) \(log scale\)/)
    const numberPicture = await page.locator('[data-chart="size-distribution"] canvas').first().screenshot()
    await page.locator('input[name="size-moment"]').nth(2).check()
    await expect.poll(() => axes('size-distribution')).toMatch(/^dV\/dlogDp/)
    await expect.poll(async () => (await page.locator('[data-chart="size-distribution"] canvas').first().screenshot()).equals(numberPicture)).toBe(false)

    // scattering angles: the phase function on a log scale and the polarisation, both over 0–180°
    await page.locator('[data-tab="angles"]').click()
    expect(await page.locator('[data-chart="phase-function"]').getAttribute('data-y-scale')).toBe('log')
    expect(await axes('phase-function')).toMatch(/P\(θ\).*\(log scale\) against Scattering angle/)
    expect(await page.locator('[data-chart="polarisation"]').getAttribute('data-y-scale')).toBe('linear')
    expect(await axes('polarisation')).toMatch(/S₁₂\/S₁₁ .* against Scattering angle/)

    // f(RH): water uptake raises the scattering of the humid sulfate–nitrate sample at 85 % RH well above the dry
    // value (f(85 %) of ammonium sulfate about 1.5–2.5, common practice)
    await page.locator('.sample-item[data-sample="Humid sulfate–nitrate episode"] button.sample-name').click()
    await page.locator('[data-tab="humidity"]').click()
    const f85 = page.locator('[data-view="humidity"] tbody tr td').nth(3)
    await f85.waitFor({ timeout: 60_000 })
    expect(Number(((await f85.textContent()) ?? '').split(' ')[0])).toBeGreaterThan(1.2)
    expect(await axes('f-rh')).toMatch(/against Relative humidity/)

    // climate: the thin-layer forcing changes sign at the stated surface albedo (Chylek & Wong 1995, GRL 22, 929):
    // over a surface darker than that the layer of wood smoke cools, over a brighter one it warms
    await page.locator('.sample-item[data-sample="Winter wood smoke"] button.sample-name').click()
    await page.locator('[data-tab="climate"]').click()
    await waitForResults(page)
    const flip = shownNumber(await page.getByTestId('flip-albedo').textContent())
    expect(flip).toBeGreaterThan(0.05)
    expect(flip).toBeLessThan(0.85)
    await page.getByTestId('surface').selectOption('custom')
    const albedo = page.locator('[data-path="site.surface_albedo"]')
    for (const [value, verdict] of [[Math.max(0, flip - 0.2), 'cools'], [Math.min(1, flip + 0.15), 'warms']] as const) {
      await albedo.fill(value.toFixed(3))
      await expect.poll(() => page.getByTestId('verdict').getAttribute('data-verdict'), { timeout: 60_000 }).toBe(verdict)
      // the sign flips at the same albedo whatever the surface
      expect(Math.abs(shownNumber(await page.getByTestId('flip-albedo').textContent()) - flip)).toBeLessThan(0.002)
    }
    // the thin-layer and two-stream estimates side by side, then the infrared and the net, one column for the sample
    const methods = page.getByTestId('methods-table')
    expect(await methods.locator('tbody tr').count()).toBe(9)
    expect(await methods.textContent()).toMatch(/Chylek & Wong.*Two-stream.*Infrared.*Net/s)
    expect(await axes('forcing-map')).toMatch(/Single-scattering albedo ω against Surface albedo Rs.*zero line/)
    // the verdict gives the sunlight, infrared and net parts; an infrared site input out of range is marked at its
    // field with the range and the reason
    expect(await page.getByTestId('net-forcing').textContent()).toMatch(/W m⁻²/)
    expect(await page.getByTestId('longwave-forcing').textContent()).toMatch(/\/.*W m⁻²/)
    const ts = page.locator('[data-path="site.surface_temperature_k"]')
    await ts.fill('400')
    await expect.poll(() => ts.getAttribute('aria-invalid'), { timeout: 10_000 }).toBe('true')
    expect(await page.locator('[data-error-for="site.surface_temperature_k"]').first().textContent()).toMatch(/outside 180 to 350 K \(/)
    await ts.fill('300')
    await expect.poll(() => ts.getAttribute('aria-invalid'), { timeout: 10_000 }).toBe('false')
  })

  test('no request leaves the machine', () => {
    expect(requests.length).toBeGreaterThan(0)
    expect(requests.filter((u) => !isLocal(u))).toEqual([])
  })
})
