// Screenshots of the main views at 1366×768, light and dark, into resources/screenshots/.
// Regenerate with:  npx tsx test/e2e/screenshots.ts   (needs Chromium, like the e2e tests)
import { mkdir } from 'node:fs/promises'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { buildAndServe, isLocal, launchChromium, ROOT } from './harness.ts'

const OUT = process.argv[2] ?? join(ROOT, 'resources', 'screenshots')

async function ready(page: Page): Promise<void> {
  await page.locator('[data-status="ok"]').waitFor({ timeout: 120_000 })
  await page.waitForTimeout(300)
}

/** Scrolls the results panel so that `selector`'s top sits `above` pixels below the panel's top. */
async function scrollPanelTo(page: Page, selector: string, above = 8): Promise<void> {
  await page.evaluate(
    ([sel, gap]) => {
      const panel = document.getElementById('result-panel')
      const el = document.querySelector(sel as string)
      if (panel && el) panel.scrollTop += el.getBoundingClientRect().top - panel.getBoundingClientRect().top - (gap as number)
    },
    [selector, above] as const
  )
  await page.waitForTimeout(300)
}

const pickSample = (page: Page, name: string) => page.locator(`.sample-item[data-sample="${name}"] button.sample-name`).click()

/** The three tool views: a Monte Carlo run, a closure retrieval, the instrument corrections. */
async function tools(page: Page, theme: string): Promise<void> {
  await pickSample(page, 'Winter wood smoke')
  await page.locator('[data-tab="uncertainty"]').click()
  const input = (rest: string) => page.locator(`[data-path="uncertainty.samples.Winter wood smoke.inputs[0].${rest}"]`)
  await page.getByTestId('add-sample-input').click()
  await input('distribution.gsd').fill('2')
  await input('bounds.method').selectOption('resample')
  await input('bounds.lo').fill('0.1')
  await input('bounds.hi').fill('10')
  await page.getByTestId('add-site-input').click()
  await page.locator('[data-path="uncertainty.draws"]').fill('600')
  await page.waitForTimeout(400)
  await page.getByTestId('uncertainty-run').click()
  await page.getByTestId('p-warm').waitFor({ timeout: 120_000 })
  await page.waitForTimeout(300)
  await page.screenshot({ path: join(OUT, `uncertainty-editor-${theme}.png`) })
  await scrollPanelTo(page, '[data-testid="uncertainty-results"]')
  await page.screenshot({ path: join(OUT, `uncertainty-${theme}.png`) })

  // Closure on the coated soot, from its own coefficients at three wavelengths (5 % uncertainty).
  await pickSample(page, 'Aged soot with sulfate coating')
  await page.locator('[data-tab="optics"]').click()
  await ready(page)
  const at = async (nm: number, col: string) => (await page.locator(`[data-testid="optics-table"] tr[data-wavelength="${nm}"] td[data-col="${col}"]`).textContent()) ?? ''
  const values = []
  for (const nm of [450, 550, 700]) values.push({ nm, sca: await at(nm, 'σsca'), abs: await at(nm, 'σabs') })
  await page.locator('[data-tab="closure"]').click()
  for (let j = 0; j < values.length; j++) {
    if (j > 0) await page.getByTestId('closure-add-row').click()
    await page.locator(`[data-field="closure-wavelength-${j}"]`).fill(String(values[j].nm))
    await page.locator(`[data-field="closure-sca-${j}"]`).fill(values[j].sca)
    await page.locator(`[data-field="closure-scaSd-${j}"]`).fill('5 %')
    await page.locator(`[data-field="closure-abs-${j}"]`).fill(values[j].abs)
    await page.locator(`[data-field="closure-absSd-${j}"]`).fill('5 %')
  }
  await page.getByTestId('closure-run').click()
  await page.getByTestId('closure-results').waitFor({ timeout: 120_000 })
  await page.waitForTimeout(300)
  await scrollPanelTo(page, '[data-testid="closure-form"]', 4)
  await page.screenshot({ path: join(OUT, `closure-${theme}.png`) })
  // Scattering alone at one wavelength: not unique.
  for (let j = values.length - 1; j > 0; j--) await page.getByRole('button', { name: `Remove row ${j + 1}` }).click()
  await page.locator('[data-field="closure-abs-0"]').fill('')
  await page.locator('[data-field="closure-absSd-0"]').fill('')
  await page.getByTestId('closure-run').click()
  await page.locator('[data-testid="closure-warnings"][data-unique="false"]').waitFor({ timeout: 120_000 })
  await page.waitForTimeout(300)
  await scrollPanelTo(page, '[data-testid="closure-form"]', 4)
  await page.screenshot({ path: join(OUT, `closure-not-unique-${theme}.png`) })

  // Instrument corrections for the dust.
  await pickSample(page, 'Quarry dust event')
  await page.locator('[data-tab="instruments"]').click()
  await page.getByTestId('neph-run').click()
  await page.getByTestId('truncation-table').waitFor({ timeout: 120_000 })
  await page.getByTestId('opc-run').click()
  await page.getByTestId('rebin-edges').waitFor({ timeout: 120_000 })
  await page.waitForTimeout(300)
  await scrollPanelTo(page, '[data-view="instruments"]', 8)
  await page.screenshot({ path: join(OUT, `instruments-${theme}.png`) })
  await scrollPanelTo(page, '[data-testid="counter"]', 4)
  await page.screenshot({ path: join(OUT, `instruments-counter-${theme}.png`) })
  await pickSample(page, 'Winter wood smoke')
}

async function main(): Promise<void> {
  await mkdir(OUT, { recursive: true })
  const browser = await launchChromium()
  const served = await buildAndServe()
  const outside: string[] = []
  try {
    for (const theme of ['light', 'dark'] as const) {
      const context = await browser.newContext({ viewport: { width: 1366, height: 768 }, colorScheme: theme })
      context.on('request', (r) => {
        if (!isLocal(r.url())) outside.push(r.url())
      })
      const page = await context.newPage()
      await page.goto(served.url)
      await page.locator('[data-dialog="cautions"]').waitFor()
      await page.waitForTimeout(300)
      await page.screenshot({ path: join(OUT, `cautions-${theme}.png`) })
      await page.getByTestId('cautions-ok').click()
      await ready(page)
      await page.screenshot({ path: join(OUT, `optics-${theme}.png`) })
      for (const tab of ['angles', 'humidity', 'climate'] as const) {
        await page.locator(`[data-tab="${tab}"]`).click()
        // the f(RH) curve follows the other figures (a second pass in the worker)
        if (tab === 'humidity') await page.locator('[data-view="humidity"] canvas').first().waitFor({ timeout: 60_000 })
        await page.waitForTimeout(300)
        await page.screenshot({ path: join(OUT, `${tab}-${theme}.png`) })
      }
      const toggles = page.getByTestId('compare-toggle')
      await toggles.nth(0).check()
      await toggles.nth(2).check()
      await toggles.nth(3).check()
      await ready(page)
      await page.screenshot({ path: join(OUT, `climate-compare-${theme}.png`) })
      await page.locator('[data-tab="compare"]').click()
      await page.waitForTimeout(300)
      await page.screenshot({ path: join(OUT, `side-by-side-${theme}.png`) })
      await page.locator('[data-tab="optics"]').click()
      await page.waitForTimeout(300)
      await page.screenshot({ path: join(OUT, `optics-compare-${theme}.png`) })
      for (let i = 3; i >= 0; i--) if (await toggles.nth(i).isChecked()) await toggles.nth(i).uncheck()
      await page.locator('[data-path="samples[0].size.modes[1].gsd"]').fill('0.9')
      await page.waitForTimeout(600)
      await page.screenshot({ path: join(OUT, `bad-input-${theme}.png`) })
      await page.locator('[data-path="samples[0].size.modes[1].gsd"]').fill('1.7')
      await ready(page)
      await tools(page, theme)
      await page.locator('[data-tab="optics"]').click()
      await ready(page)
      await page.getByTestId('report').click()
      await page.waitForTimeout(800)
      await page.screenshot({ path: join(OUT, `report-${theme}.png`) })
      await page.getByTestId('close-report').click()
      // the component view, on a component whose k changes with wavelength
      await page.getByTestId('open-catalogue').click()
      await page.locator('[data-component="brown-carbon"] [data-testid="catalogue-pick"]').click()
      await page.locator('[data-chart="catalogue-k"] canvas').first().waitFor()
      await page.waitForTimeout(300)
      await page.screenshot({ path: join(OUT, `catalogue-${theme}.png`) })
      await page.getByTestId('catalogue-close').click()
      // the recovery copy offered after a reload without saving
      await page.getByTestId('study-name').fill('Harrowmere, edited before a reload')
      await page.waitForFunction(() => (localStorage.getItem('motebench.recovery') ?? '').includes('edited before a reload'))
      await page.evaluate(() => (window.onbeforeunload = null))
      await page.reload()
      await page.getByTestId('recovery-offer').waitFor()
      await page.waitForTimeout(300)
      await page.screenshot({ path: join(OUT, `recovery-${theme}.png`) })
      await context.close()
    }
  } finally {
    await browser.close()
    await served.close()
  }
  if (outside.length) throw new Error(`requests left the machine: ${outside.join(', ')}`)
  console.log(`screenshots written to ${OUT}`)
}

await main()
