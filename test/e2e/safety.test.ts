// End-to-end: the work is safe and the figures' grounds can be seen, in the web build in headless Chromium.
// Undo and redo as buttons and from the delete notice; the recovery copy kept across a reload, offered, restored
// or discarded; a CSV given to Open… pointed to the sizer import; the component catalogue with the values src-core
// gives; a sample's components reordered, which changes the core of a core–shell particle.
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { describe, expect, test } from 'vitest'
import { getMaterial, indexSourceAt, listMaterials, refractiveIndexAt, demoStudy } from '../../src-core/index.ts'
import { appSession, isLocal, ROOT } from './harness.ts'

const session = appSession()
const RECOVERY_KEY = 'motebench.recovery' // src-renderer/host/browser.ts

async function openApp(o: { wait?: boolean } = {}): Promise<Page> {
  const { page, errors } = await session.open(o)
  expect(errors).toEqual([])
  // the page asks before discarding work (window.confirm, beforeunload): the user says yes
  page.on('dialog', (d) => void d.accept())
  return page
}

const names = (page: Page) => page.locator('.sample-item').evaluateAll((li) => li.map((x) => x.getAttribute('data-sample') ?? ''))
const recoveryCopy = (page: Page) => page.evaluate((key) => localStorage.getItem(key), RECOVERY_KEY)
const pick = (page: Page, name: string) => page.locator(`.sample-item[data-sample="${name}"] button.sample-name`).click()

async function sigma(page: Page, col: string, nm = 550): Promise<number> {
  return Number(await page.locator(`[data-testid="optics-table"] tr[data-wavelength="${nm}"] td[data-col="${col}"]`).textContent())
}

describe('safety of work', { timeout: 120_000 }, () => {
  test('the delete notice and the Undo button restore a deleted sample; Redo deletes it again', async () => {
    const page = await openApp({ wait: false })
    const first = await names(page)
    const undo = page.getByTestId('undo')
    const redo = page.getByTestId('redo')
    // nothing done yet: nothing to undo or redo
    expect(await undo.isDisabled()).toBe(true)
    expect(await redo.isDisabled()).toBe(true)

    await pick(page, first[1])
    await page.getByTestId('delete-sample').click()
    expect(await names(page)).toEqual(first.filter((n) => n !== first[1]))
    expect(await page.getByTestId('toast').textContent()).toContain(`Deleted sample “${first[1]}”.`)
    await page.getByTestId('toast-undo').click()
    expect(await names(page)).toEqual(first)
    expect(await page.getByTestId('toast').count()).toBe(0)

    // the same with the header's buttons
    await pick(page, first[2])
    await page.getByTestId('delete-sample').click()
    expect(await undo.isEnabled()).toBe(true)
    await undo.click()
    expect(await names(page)).toEqual(first)
    expect(await redo.isEnabled()).toBe(true)
    await redo.click()
    expect(await names(page)).toEqual(first.filter((n) => n !== first[2]))
    expect(await redo.isDisabled()).toBe(true)
  })

  test('the recovery copy survives a reload, says when it was made, and is restored; then discarded', async () => {
    const page = await openApp({ wait: false })
    expect(await recoveryCopy(page)).toBeNull() // the demo, untouched: nothing to keep
    await page.getByTestId('study-name').fill('Field week, edited')
    await pick(page, 'Quarry dust event')
    await page.getByTestId('delete-sample').click()
    // written shortly after the last edit (RECOVERY_DELAY_MS, 1 s), without saving
    await expect.poll(() => recoveryCopy(page).then((c) => c && JSON.parse(c).text.includes('Quarry dust event')), { timeout: 10_000 }).toBe(false)
    const copy = JSON.parse((await recoveryCopy(page)) as string) as { savedAt: string; name: string }
    expect(copy.name).toBe('Field week, edited')

    await page.reload()
    const offer = page.getByTestId('recovery-offer')
    await offer.waitFor()
    expect(await offer.textContent()).toContain('“Field week, edited” (4 samples, never saved)')
    // the time of the copy in ISO 8601 order, in the page's local time
    const when = (await page.getByTestId('recovery-when').textContent()) ?? ''
    const local = await page.evaluate((iso) => {
      const d = new Date(iso)
      const two = (x: number) => String(x).padStart(2, '0')
      return `${d.getFullYear()}-${two(d.getMonth() + 1)}-${two(d.getDate())} ${two(d.getHours())}:${two(d.getMinutes())}`
    }, copy.savedAt)
    expect(when).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2} \(.*ago\)$/)
    expect(when.startsWith(local)).toBe(true)
    // meanwhile the demo is on screen, and the copy is not overwritten by it
    expect((await names(page)).length).toBe(5)
    await page.getByTestId('recovery-restore').click()
    expect(await offer.count()).toBe(0)
    expect(await page.getByTestId('study-name').inputValue()).toBe('Field week, edited')
    expect(await names(page)).not.toContain('Quarry dust event')
    expect((await names(page)).length).toBe(4)
    expect(await page.locator('.topbar .dirty').count()).toBe(1) // restored work is still unsaved

    // still unsaved, so offered again after another reload; this time it is discarded
    await page.reload()
    await offer.waitFor()
    await page.getByTestId('recovery-discard').click()
    expect(await offer.count()).toBe(0)
    expect(await recoveryCopy(page)).toBeNull()
    expect((await names(page)).length).toBe(5)
    await page.reload()
    await page.locator('.sample-item').first().waitFor()
    expect(await offer.count()).toBe(0)
  })

  test('saving (the study downloaded) removes the recovery copy', async () => {
    const page = await openApp({ wait: false })
    await page.getByTestId('study-name').fill('To be saved')
    await expect.poll(() => recoveryCopy(page), { timeout: 10_000 }).not.toBeNull()
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('save').click()])
    expect(download.suggestedFilename()).toBe('To-be-saved.mote')
    await expect.poll(() => recoveryCopy(page)).toBeNull()
  })

  test('a CSV given to Open… is named for what it is and the sizer import is pointed to; the study stays', async () => {
    const page = await openApp({ wait: false })
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('open').click()])
    await chooser.setFiles(join(ROOT, 'resources', 'sizer-single-comma.csv'))
    const notice = page.getByTestId('notice')
    await notice.waitFor()
    const text = (await notice.textContent()) ?? ''
    expect(text).toContain('“sizer-single-comma.csv” is a table of values (like a sizer export), not a study')
    expect(text).toContain('Import sizer file…')
    expect(text).not.toMatch(/JSON/)
    expect((await names(page)).length).toBe(5)
  })

  test('the instrument defaults are labelled as examples to replace', async () => {
    const page = await openApp({ wait: false })
    await page.locator('[data-tab="instruments"]').click()
    expect(await page.getByTestId('neph-example-note').textContent()).toMatch(/Example values:.*7–170°.*Replace them with your own nephelometer’s figures/)
    expect(await page.getByTestId('opc-example-note').textContent()).toMatch(/Example values:.*bin edges, the 633 nm laser.*Replace them with your own counter’s figures/)
  })
})

describe('the components and their order', { timeout: 120_000 }, () => {
  test("the catalogue shows each component's n and k at the study's wavelengths and the row's source, as src-core gives them", async () => {
    const page = await openApp({ wait: false })
    // an own component, so that the study's own ones are listed too
    const own = page.locator('[data-testid="own-components"]')
    if ((await own.getAttribute('open')) === null) await own.locator('> summary').click()
    await page.getByTestId('add-own-component').click()
    await page.locator('[data-path="user_materials[0].id"]').fill('lab-haze')
    await page.locator('[data-path="user_materials[0].name"]').fill('Lab haze')
    await page.locator('[data-path="user_materials[0].index.n"]').fill('1.61')
    await page.locator('[data-path="user_materials[0].index.k"]').fill('0.02')

    await page.getByTestId('open-catalogue').click()
    const dialog = page.locator('[data-dialog="catalogue"]')
    await dialog.waitFor()
    const list = dialog.getByTestId('catalogue-list')
    expect(await list.locator('tbody tr').count()).toBe(listMaterials().length + 1)
    expect(await list.locator('tr[data-component="own:lab-haze"]').textContent()).toContain('Lab haze (own)')

    const wavelengths = demoStudy().wavelengths_nm
    for (const id of ['ammonium-sulfate', 'water']) {
      const m = getMaterial(id)
      await list.locator(`tr[data-component="${id}"] [data-testid="catalogue-pick"]`).click()
      const detail = dialog.locator(`[data-testid="catalogue-detail"][data-component="${id}"]`)
      await detail.waitFor()
      expect(await detail.locator('[data-fact="density"]').textContent()).toContain(`${m.densityGcm3} g cm⁻³`)
      expect(await detail.locator('[data-fact="density"]').textContent()).toContain(m.sources.density)
      expect(await detail.locator('[data-fact="kappa"]').textContent()).toContain(m.sources.kappa)
      const rows = detail.locator('[data-testid="catalogue-index"] tbody tr')
      expect(await rows.count()).toBe(wavelengths.length)
      for (const nm of wavelengths) {
        const row = detail.locator(`[data-testid="catalogue-index"] tr[data-wavelength="${nm}"]`)
        const want = refractiveIndexAt(m, nm / 1000)
        // n shown to 4 significant digits, k to 3
        const n = Number(await row.locator('[data-col="n"]').textContent())
        const k = Number(await row.locator('[data-col="k"]').textContent())
        expect(Math.abs(n - want.n) / want.n, `${id} n at ${nm} nm`).toBeLessThan(5e-4)
        expect(Math.abs(k - want.k), `${id} k at ${nm} nm`).toBeLessThanOrEqual(want.k * 5e-3)
        expect(await row.locator('[data-col="source"]').getAttribute('title'), `${id} source at ${nm} nm`).toBe(indexSourceAt(m, nm / 1000))
      }
      // the charts of n and k over the tabulated range
      expect(await detail.locator('[data-chart="catalogue-n"] canvas').count()).toBeGreaterThan(0)
      expect(await detail.locator('[data-chart="catalogue-k"] [data-chart-axes]').textContent()).toMatch(/^k .*against Wavelength/)
    }
    // the own component: its constant index at every study wavelength, with its source
    await list.locator('tr[data-component="own:lab-haze"] [data-testid="catalogue-pick"]').click()
    const mine = dialog.locator('[data-testid="catalogue-detail"][data-component="own:lab-haze"]')
    await mine.waitFor()
    expect(await mine.locator('tr[data-wavelength="550"] [data-col="n"]').textContent()).toBe('1.61')
    expect(await mine.locator('tr[data-wavelength="550"] [data-col="k"]').textContent()).toBe('0.02')
    await dialog.getByTestId('catalogue-close').click()
    expect(await dialog.count()).toBe(0)
  })

  test('moving a component (by keyboard) changes which one is the core of a core–shell particle', async () => {
    const page = await openApp({ wait: false })
    const i = demoStudy().samples.findIndex((x) => x.composition.mixing === 'core-shell')
    const sample = demoStudy().samples[i]
    expect(sample.composition.components[0].material).toBe('black-carbon')
    await pick(page, sample.name)
    await page.locator('#result-panel[data-fresh="true"]').waitFor({ timeout: 60_000 })
    const before = await sigma(page, 'σabs')
    const base = `samples[${i}].composition.components`
    const material = (j: number) => page.locator(`[data-path="${base}[${j}].material"]`).inputValue()
    const coreRow = page.locator(`tr[data-component]:has([data-role="core"])`)
    expect(await coreRow.getAttribute('data-component')).toBe('black-carbon')

    // by keyboard: focus the core's "move down" button, press Enter; the focus follows the moved component
    await page.locator(`[data-move="${base}[0]:down"]`).focus()
    await page.keyboard.press('Enter')
    expect(await material(0)).toBe('ammonium-sulfate')
    expect(await material(1)).toBe('black-carbon')
    expect(await coreRow.getAttribute('data-component')).toBe('ammonium-sulfate')
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('data-move'))).toBe(`${base}[1]:up`)
    // a sulfate core in a soot shell absorbs differently from a soot core in a sulfate shell (the lensing of the
    // coating is gone; Bohren & Huffman 1983, coated spheres)
    await expect.poll(() => sigma(page, 'σabs'), { timeout: 60_000 }).not.toBe(before)
    await page.locator('#result-panel[data-fresh="true"]').waitFor({ timeout: 60_000 })

    // Enter again moves it back up; the undo history holds the move too
    await page.keyboard.press('Enter')
    expect(await material(0)).toBe('black-carbon')
    await page.getByTestId('undo').click()
    expect(await material(0)).toBe('ammonium-sulfate')
    await page.getByTestId('undo').click()
    expect(await material(0)).toBe('black-carbon')
    await expect.poll(() => sigma(page, 'σabs'), { timeout: 60_000 }).toBe(before)
  })

  test('no request leaves the machine', () => {
    expect(session.requests.length).toBeGreaterThan(0)
    expect(session.requests.filter((u) => !isLocal(u))).toEqual([])
  })
})
