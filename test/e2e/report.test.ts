// End-to-end: the printed report writes out everything that decides a sample's results (modes as entered, the main
// composition and the modes' own ones, measured bins with their source, the study's own components), in the web
// build of the app in headless Chromium.
import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import type { Locator, Page } from 'playwright-core'
import { describe, expect, test } from 'vitest'
import { demoStudy } from '../../src-core/index.ts'
import { appSession, isLocal, ROOT, shownNumber } from './harness.ts'

const session = appSession()

async function openApp(o: { wait?: boolean } = {}): Promise<Page> {
  const { page, errors } = await session.open(o)
  expect(errors).toEqual([])
  return page
}

async function openReport(page: Page): Promise<Locator> {
  await page.getByTestId('report').click()
  const report = page.locator('.report-page')
  await report.waitFor()
  return report
}

const text = async (l: Locator): Promise<string> => ((await l.textContent()) ?? '').replace(/\s+/g, ' ')

/** Adds an own component in the editor and gives it an id and a name. */
async function addOwnComponent(page: Page, index: number, id: string, name: string): Promise<void> {
  const list = page.locator('[data-testid="own-components"]')
  if ((await list.getAttribute('open')) === null) await list.locator('> summary').click()
  await page.getByTestId('add-own-component').click()
  await page.locator(`[data-path="user_materials[${index}].id"]`).fill(id)
  await page.locator(`[data-path="user_materials[${index}].name"]`).fill(name)
}

describe('the report', { timeout: 120_000 }, () => {
  test("the demo's per-mode composition is written out, and which modes use the main composition", async () => {
    const page = await openApp({ wait: false })
    const report = await openReport(page)
    // the demo study (src-core/study/demo.ts) has no own components: the report has no section for them
    expect(await report.getByTestId('report-own-components').count()).toBe(0)

    // Coastal haze day: 70 % ammonium sulfate + 30 % sea salt for the accumulation mode; the coarse mode is all sea salt
    const haze = report.locator('[data-report-sample="Coastal haze day"]')
    const main = await text(haze.locator('[data-report-composition="main"]'))
    expect(main).toContain('Ammonium sulfate 70 %')
    expect(main).toContain('Sea salt 30 %')
    expect(main).toContain('Used for mode 1 (accumulation); mode 2 (sea-salt coarse) has its own composition')
    const coarse = await text(haze.locator('[data-report-composition="mode-1"]'))
    expect(coarse).toContain('Composition of mode 2 sea-salt coarse')
    expect(coarse).toContain('Sea salt 100 %')
    expect(await haze.locator('[data-report-composition="mode-0"]').count()).toBe(0)
    // the modes as entered: the coarse mode is given by volume, 18 µm³ cm⁻³ at a VMD of 2.5 µm and σg 2
    const coarseMode = await text(haze.locator('[data-report-mode="1"]'))
    expect(coarseMode).toContain('V = 18 µm³ cm⁻³')
    expect(coarseMode).toContain('VMD 2.5 µm')
    expect(coarseMode).toContain('its own (below)')

    // the core–shell sample names its core and its shell
    const soot = await text(report.locator('[data-report-sample="Aged soot with sulfate coating"] [data-report-composition="main"]'))
    expect(soot).toContain('core: Black carbon 15 %; shell: Ammonium sulfate 85 %')
    expect(soot).toMatch(/core–shell/)
    // a sample without per-mode compositions: the main one is used for all its modes
    const dust = report.locator('[data-report-sample="Quarry dust event"]')
    expect(await text(dust.locator('[data-report-composition="main"]'))).toContain('Used for all 2 modes')
    expect(await dust.locator('[data-report-composition^="mode-"]').count()).toBe(0)

    // the cautions, references and software version stay
    expect(await text(report.locator('.report-cautions'))).toMatch(/respirat/i)
    expect(await text(report.locator('.report-references'))).toMatch(/Produced with Motebench \d+\.\d+\.\d+/)
  })

  test('an own component, and a mode made of it core–shell, appear in the report once added in the editor', async () => {
    const page = await openApp()
    await addOwnComponent(page, 0, 'lab-soot', 'Lab soot')
    await page.locator('[data-path="user_materials[0].density_g_cm3"]').fill('1.8')
    await page.locator('[data-path="user_materials[0].kappa"]').fill('0.05')
    await page.locator('[data-path="user_materials[0].index.n"]').fill('1.8')
    await page.locator('[data-path="user_materials[0].index.k"]').fill('0.6')
    expect(await page.locator('[data-error-for^="user_materials[0]"]').count()).toBe(0)

    // Winter wood smoke (the first sample, selected): its Aitken mode gets its own composition, a Lab soot core
    await page.locator('[data-path="samples[0].size.modes[0].composition"]').check()
    const core = page.locator('[data-path="samples[0].size.modes[0].composition.components[0].material"]')
    await core.waitFor()
    await core.selectOption('lab-soot')
    await page.locator('[data-path="samples[0].size.modes[0].composition.mixing"]').selectOption('core-shell')

    const report = await openReport(page)
    const own = report.getByTestId('report-own-components')
    const row = await text(own.locator('tr[data-own-component="lab-soot"]'))
    expect(row).toContain('Lab soot')
    expect(row).toContain('n = 1.8, k = 0.6 at every wavelength')
    expect(row).toContain('1.8 g cm⁻³')
    expect(row).toContain('0.05')
    // a constant index needs no table of values at the study's wavelengths
    expect(await own.getByTestId('report-own-index').count()).toBe(0)

    const smoke = report.locator('[data-report-sample="Winter wood smoke"]')
    // the mode's own composition started as a copy of the sample's (80 % organic matter first), now with the Lab soot core
    const modeComp = await text(smoke.locator('[data-report-composition="mode-0"]'))
    expect(modeComp).toContain('Composition of mode 1 Aitken')
    expect(modeComp).toContain('core: Lab soot (own) 80 %; shell: Brown carbon 14 %, Black carbon 6 %')
    expect(modeComp).toMatch(/core–shell/)
    // the main composition is unchanged and says plainly that only the accumulation mode uses it
    const main = await text(smoke.locator('[data-report-composition="main"]'))
    expect(main).toContain('Organic matter')
    expect(main).not.toContain('Lab soot')
    expect(main).toContain('Used for mode 2 (accumulation); mode 1 (Aitken) has its own composition')
    expect(await text(smoke.locator('[data-report-mode="0"]'))).toContain('its own (below)')
    expect(await text(smoke.locator('[data-report-mode="1"]'))).toContain('the main one')
  })

  test("an own component given by expressions is tabulated at the study's wavelengths", async () => {
    const page = await openApp()
    await addOwnComponent(page, 0, 'blue-tail', 'Blue tail')
    await page.locator('[data-path="user_materials[0].index.kind"]').selectOption('expression')
    await page.locator('[data-path="user_materials[0].index.n"]').fill('1.6')
    await page.locator('[data-path="user_materials[0].index.k"]').fill('0.01 * wl_nm / 550')
    await addOwnComponent(page, 1, 'flat-grey', 'Flat grey') // constant: not in the table of values
    expect(await page.locator('[data-error-for^="user_materials"]').count()).toBe(0)

    const report = await openReport(page)
    const own = report.getByTestId('report-own-components')
    expect(await own.locator('tbody tr[data-own-component]').count()).toBe(2)
    expect(await text(own.locator('tr[data-own-component="blue-tail"] [data-col="index"]'))).toContain('k = 0.01 * wl_nm / 550')
    const table = own.getByTestId('report-own-index')
    expect(await table.count()).toBe(1)
    expect(await table.locator('td[data-own-component="flat-grey"]').count()).toBe(0)
    // one row per study wavelength, each with n = 1.6 and k = 0.01·λ/550 nm (the expression typed above)
    const wavelengths = demoStudy().wavelengths_nm
    expect(await table.locator('tbody tr').count()).toBe(wavelengths.length)
    for (const w of wavelengths) {
      const cell = await text(table.locator(`tr[data-wavelength="${w}"] td[data-own-component="blue-tail"]`))
      const m = /^\s*([-\d.e]+) \+ ([-\d.e]+)i\s*$/.exec(cell)
      expect(m, cell).not.toBeNull()
      expect(Number(m![1])).toBe(1.6)
      const k = (0.01 * w) / 550
      expect(Math.abs(Number(m![2]) - k) / k).toBeLessThan(1e-3) // shown to 4 significant digits
    }
  })

  test('a sample of measured bins gives its source and every bin', async () => {
    const page = await openApp({ wait: false })
    const file = join(ROOT, 'resources', 'sizer-single-comma.csv')
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('import-sizer').click()])
    await chooser.setFiles(file)
    await page.getByTestId('sizer-apply').click()
    await page.getByTestId('bins-panel').waitFor()
    // the file's data rows are the lines that start with a number (the rest are its header)
    const rows = (await readFile(file, 'utf8')).split(/\r?\n/).filter((l) => /^\s*\d/.test(l))

    const report = await openReport(page)
    const section = report.locator('.report-sample').nth(5)
    const summary = await text(section.locator('[data-part="bins-summary"]'))
    expect(summary).toContain(`${rows.length} measured bins`)
    expect(summary).toContain('sizer-single-comma.csv')
    expect(await section.locator('.report-bins li').count()).toBe(rows.length)
    expect(await text(section.locator('[data-report-composition="main"]'))).toContain('Used for the measured bins')
  })

  test('each sample has its verdict, charts, optics table and methods table; the cautions and references are all there', async () => {
    const page = await openApp()
    await page.locator('[data-status="ok"]').waitFor({ timeout: 80_000 }) // every sample computed
    const tableSigma = shownNumber(await page.locator('[data-testid="optics-table"] tr[data-wavelength="550"] td[data-col="σext"]').textContent())
    const report = await openReport(page)
    const names = demoStudy().samples.map((x) => x.name)
    for (const name of names) {
      const sec = report.locator(`[data-report-sample="${name}"]`)
      expect(await sec.getByTestId('verdict').getAttribute('data-verdict'), name).toMatch(/^(cools|warms|too close to call)$/)
      expect(await sec.locator('figure.chart canvas').count(), name).toBeGreaterThanOrEqual(3)
      expect(await sec.locator('[data-testid="optics-table"] tbody tr').count(), name).toBe(demoStudy().wavelengths_nm.length)
      expect(await sec.getByTestId('methods-table').locator('tbody tr').count(), name).toBe(9)
      expect(await sec.locator('.stale-note').count(), name).toBe(0)
    }
    // the infrared part's method, with its assumptions and limits, and the site's infrared inputs
    expect(await report.getByTestId('report-longwave-method').textContent()).toMatch(/Toon et al\. 1989.*net.*Assumptions and limits/s)
    expect(await report.locator('header').textContent()).toMatch(/surface temperature [\d.]+ K.*water-vapour column/s)
    // the selected sample's σext at 550 nm is the one the workbench showed
    const first = report.locator(`[data-report-sample="${names[0]}"] [data-testid="optics-table"] tr[data-wavelength="550"] td[data-col="σext"]`)
    expect(shownNumber(await first.textContent())).toBe(tableSigma)
    const cautions = await text(report.locator('.report-cautions'))
    for (const word of [/fine particles/i, /soot/i, /crystalline silica/i, /respirat/i, /exposure limits/i, /not a climate projection/i]) expect(cautions).toMatch(word)
    const refs = await text(report.locator('.report-references'))
    for (const word of ['Bohren', 'Wiscombe', 'Chylek', 'Petters', 'delta-Eddington']) expect(refs).toContain(word)
    expect(refs).toMatch(/Produced with Motebench \S+/)
  })

  test('the report is dated in ISO 8601, labels the ω and g axis, and charts each size distribution', async () => {
    const page = await openApp()
    await page.locator('[data-status="ok"]').waitFor({ timeout: 80_000 }) // every sample computed
    const report = await openReport(page)
    // ISO 8601 date and time (2026-12-03 17:40), the page's local date
    const made = await text(report.getByTestId('report-date'))
    expect(made).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}$/)
    const today = await page.evaluate(() => {
      const d = new Date()
      return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`
    })
    expect(made.startsWith(today)).toBe(true)
    expect(await text(report.locator('.meta').first())).not.toMatch(/\d+\/\d+\/\d{4}/)
    const samples = demoStudy().samples
    for (let i = 0; i < samples.length; i++) {
      const sec = report.locator(`[data-report-sample="${samples[i].name}"]`)
      expect(await text(sec.locator(`[data-chart="report-ssa-${i}"] [data-chart-axes]`))).toMatch(/^ω and g \(no unit\) against Wavelength/)
      const size = sec.locator(`[data-chart="report-size-${i}"]`)
      expect(await text(size.locator('[data-chart-axes]'))).toMatch(/^dN\/dlogDp \(cm⁻³\) against Dry diameter Dp \(µm\)/)
      expect(await size.locator('canvas').count(), samples[i].name).toBeGreaterThan(0)
    }
  })

  test('no request leaves the machine', () => {
    expect(session.requests.length).toBeGreaterThan(0)
    expect(session.requests.filter((u) => !isLocal(u))).toEqual([])
  })
})
