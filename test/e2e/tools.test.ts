// End-to-end: the three tool views (how sure is the verdict, index from measurements, instrument corrections) in
// the web build, in headless Chromium, with one build, server and browser for the whole file.
import type { Page } from 'playwright-core'
import { describe, expect, test } from 'vitest'
import { getMaterial, mixRefractiveIndices, refractiveIndexAt } from '../../src-core/index.ts'
import { appSession, isLocal, shownNumber } from './harness.ts'

const session = appSession()
const requests = session.requests
/** The app on the demo study, cautions dismissed, the selected sample's results computed. */
const openApp = () => session.open()

const tab = (page: Page, id: string) => page.locator(`[data-tab="${id}"]`).click()

/** The document path of the demo's first sample's uncertain input `j` (as the study schema names it). */
const inputPath = (j: number, rest: string) => `[data-path="uncertainty.samples.Winter wood smoke.inputs[${j}].${rest}"]`

async function opticsAt550(page: Page, col: string): Promise<number> {
  return shownNumber(await page.locator(`[data-testid="optics-table"] tr[data-wavelength="550"] td[data-col="${col}"]`).textContent())
}

describe('the tool views', { timeout: 120_000 }, () => {
  test('with no spread, P(warm) is 0 or 1 as the verdict of the climate view says', async () => {
    const { page, errors } = await openApp()
    await tab(page, 'climate')
    const verdict = await page.getByTestId('verdict').getAttribute('data-verdict')
    expect(verdict).toMatch(/^(cools|warms)$/)

    await tab(page, 'uncertainty')
    const run = page.getByTestId('uncertainty-run')
    expect(await run.isDisabled()).toBe(true) // nothing uncertain yet
    await page.getByTestId('add-sample-input').click()
    expect(await page.locator(inputPath(0, 'material')).inputValue()).toBe('black-carbon')
    await page.locator(inputPath(0, 'distribution.gsd')).fill('1') // a lognormal factor of gsd 1: no spread
    await expect.poll(() => run.isEnabled(), { timeout: 10_000 }).toBe(true)
    await run.click()
    const result = page.getByTestId('p-warm')
    await result.waitFor({ timeout: 60_000 })
    expect(Number(await result.getAttribute('data-probability'))).toBe(verdict === 'warms' ? 1 : 0)
    expect(await page.getByTestId('plain-verdict').textContent()).toBe(verdict)
    // Every draw is the plain calculation: one bar, the 5–95 % range collapsed on the plain value.
    expect(await page.getByTestId('forcing-histogram').getAttribute('data-bins')).toBe('1')
    const forcing = page.locator('[data-testid="uncertainty-table"] tr[data-figure="forcing"] td')
    const [plain, median] = [await forcing.nth(1).textContent(), await forcing.nth(2).textContent()]
    expect(median).toBe(plain)
    expect(await page.locator('[data-testid="sensitivity-table"] td[data-col="rho"]').first().textContent()).toBe('—')
    // The settings are in the study document: saved with it.
    expect(await page.locator('.dirty').count()).toBe(1)
    expect(errors).toEqual([])
  })

  test('a spread on k gives a histogram and 0 < P(warm) < 1; a bad spread is marked at its input; Cancel stops a long run', async () => {
    const { page, errors } = await openApp()
    await tab(page, 'uncertainty')
    await page.getByTestId('add-sample-input').click()
    const gsd = page.locator(inputPath(0, 'distribution.gsd'))
    // Too wide: the factor's tail would push black carbon's k beyond 10. The core's reason shows at the input.
    await gsd.fill('2')
    await page.locator('[data-path="uncertainty.draws"]').fill('400')
    const run = page.getByTestId('uncertainty-run')
    await expect.poll(() => run.isEnabled(), { timeout: 10_000 }).toBe(true)
    await run.click()
    const problem = page.getByTestId('input-problem')
    await problem.waitFor({ timeout: 30_000 })
    expect(await problem.textContent()).toMatch(/outside the valid range/)
    expect(await page.locator('[data-input="sample-0"].is-bad').count()).toBe(1)

    // Bounded factor: drawn again outside 0.1–10.
    await page.locator(inputPath(0, 'bounds.method')).selectOption('resample')
    await page.locator(inputPath(0, 'bounds.lo')).fill('0.1')
    await page.locator(inputPath(0, 'bounds.hi')).fill('10')
    await expect.poll(() => run.isEnabled(), { timeout: 10_000 }).toBe(true)
    await run.click()
    const result = page.getByTestId('p-warm')
    await result.waitFor({ timeout: 90_000 })
    const p = Number(await result.getAttribute('data-probability'))
    expect(p).toBeGreaterThan(0)
    expect(p).toBeLessThan(1)
    expect(await page.getByTestId('p-warm-value').textContent()).toBe(p.toFixed(3))
    expect(Number(await page.getByTestId('forcing-histogram').getAttribute('data-bins'))).toBeGreaterThan(3)
    expect(await page.getByTestId('forcing-histogram').getAttribute('data-zero')).toBe('inside')
    expect(await page.locator('[data-chart="forcing-histogram"] canvas').count()).toBeGreaterThan(0)
    // More absorption, warmer: k's rank correlation with the forcing is strongly positive.
    const rho = shownNumber((await page.locator('[data-testid="sensitivity-table"] td[data-col="rho"]').first().textContent())?.replace('+', '').replace('−', '-'))
    expect(rho).toBeGreaterThan(0.8)
    expect(await page.getByTestId('sensitivity-table').textContent()).toMatch(/Spearman/)

    // A long run (no early stop), cancelled part way: it stops, and the draws made are summarised.
    await page.locator('[data-path="uncertainty.draws"]').fill('100000')
    await page.locator('[data-path="uncertainty.precision"]').fill('0')
    await expect.poll(() => run.isEnabled(), { timeout: 10_000 }).toBe(true)
    await run.click()
    const progress = page.getByTestId('uncertainty-progress')
    await expect.poll(async () => Number((await progress.getAttribute('value')) ?? 0), { timeout: 30_000 }).toBeGreaterThanOrEqual(50)
    await page.getByTestId('uncertainty-cancel').click()
    await page.locator('[data-testid="p-warm"][data-status="cancelled"]').waitFor({ timeout: 15_000 })
    const draws = Number(await page.getByTestId('p-warm').getAttribute('data-draws'))
    expect(draws).toBeGreaterThanOrEqual(50)
    expect(draws).toBeLessThan(100000)
    expect(await progress.count()).toBe(0)
    expect(await run.isEnabled()).toBe(true)
    // Stopped, not still drawing in the background: the count stays put.
    await page.waitForTimeout(1000)
    expect(Number(await page.getByTestId('p-warm').getAttribute('data-draws'))).toBe(draws)
    expect(errors).toEqual([])
  })

  test('closure finds the index of a sample from its own σsca and σabs; scattering alone is not unique', async () => {
    const { page, errors } = await openApp()
    // A new sample: 90 % ammonium sulfate and 10 % black carbon by volume, dry.
    await page.getByTestId('add-sample').click()
    const base = 'samples[5]'
    await page.getByRole('button', { name: 'Add component' }).click()
    await page.locator(`[data-path="${base}.composition.components[1].material"]`).selectOption('black-carbon')
    await page.locator(`[data-path="${base}.composition.components[0].volume_fraction"]`).fill('0.9')
    await page.locator(`[data-path="${base}.composition.components[1].volume_fraction"]`).fill('0.1')
    await page.locator(`[data-path="${base}.rh_percent"]`).fill('0')
    await expect.poll(() => page.locator('[data-status="ok"]').count(), { timeout: 60_000 }).toBe(1)
    await page.locator('#result-panel[data-fresh="true"]').waitFor({ timeout: 60_000 })
    const sca = await opticsAt550(page, 'σsca')
    const abs = await opticsAt550(page, 'σabs')
    expect(sca).toBeGreaterThan(0)
    expect(abs).toBeGreaterThan(0)

    await tab(page, 'closure')
    await page.locator('[data-field="closure-wavelength-0"]').fill('550')
    await page.locator('[data-field="closure-sca-0"]').fill(String(sca))
    await page.locator('[data-field="closure-scaSd-0"]').fill('5 %')
    await page.locator('[data-field="closure-abs-0"]').fill(String(abs))
    await page.locator('[data-field="closure-absSd-0"]').fill('5 %')
    await page.getByTestId('closure-run').click()
    const best = page.getByTestId('closure-best')
    await best.waitFor({ timeout: 60_000 })
    const got = { n: Number(await best.getAttribute('data-n')), k: Number(await best.getAttribute('data-k')) }
    const sd = { n: Number(await best.getAttribute('data-sd-n')), k: Number(await best.getAttribute('data-sd-k')) }
    // The sample's own index at 550 nm: the volume average of its components' indices (its mixing rule).
    const own = mixRefractiveIndices([refractiveIndexAt(getMaterial('ammonium-sulfate'), 0.55), refractiveIndexAt(getMaterial('black-carbon'), 0.55)], [0.9, 0.1], 'volume-average')
    expect(sd.n).toBeGreaterThan(0)
    expect(sd.k).toBeGreaterThan(0)
    expect(Math.abs(got.n - own.n)).toBeLessThan(3 * sd.n)
    expect(Math.abs(got.k - own.k)).toBeLessThan(3 * sd.k)
    expect(await page.getByTestId('closure-warnings').count()).toBe(0)
    expect(await page.locator('[data-chart="chi2-map"] canvas').count()).toBeGreaterThan(0)

    // Scattering at one wavelength cannot pin down two unknowns.
    await page.locator('[data-field="closure-abs-0"]').fill('')
    await page.locator('[data-field="closure-absSd-0"]').fill('')
    await page.getByTestId('closure-run').click()
    const warnings = page.locator('[data-testid="closure-warnings"][data-unique="false"]')
    await warnings.waitFor({ timeout: 60_000 })
    expect(await warnings.textContent()).toMatch(/Not unique/)
    expect(await page.getByTestId('closure-alternative').count()).toBeGreaterThan(0)

    // A measurement without its uncertainty is marked at the field.
    await page.locator('[data-field="closure-scaSd-0"]').fill('')
    expect(await page.locator('[data-error-for="closure-scaSd-0"]').textContent()).toMatch(/uncertainty/)
    expect(await page.getByTestId('closure-run').isDisabled()).toBe(true)
    expect(errors).toEqual([])
  })

  test('nephelometer truncation factors exceed 1; a PSL-index counter keeps its bin edges', async () => {
    const { page, errors } = await openApp()
    await tab(page, 'instruments')
    await page.getByTestId('neph-run').click()
    const rows = page.locator('[data-testid="truncation-table"] tbody tr')
    await rows.first().waitFor({ timeout: 60_000 })
    expect(await rows.count()).toBe(3)
    for (let i = 0; i < 3; i++) {
      const total = Number(await rows.nth(i).locator('td[data-col="total"]').getAttribute('data-value'))
      const back = Number(await rows.nth(i).locator('td[data-col="backscatter"]').getAttribute('data-value'))
      expect(total).toBeGreaterThan(1)
      expect(back).toBeGreaterThan(1)
      expect(Math.abs(back - total)).toBeGreaterThan(1e-3)
    }
    // A bad angle is marked at its field.
    await page.locator('[data-field="neph-high"]').fill('190')
    expect(await page.locator('[data-error-for="neph-high"]').textContent()).toMatch(/outside 0° to 180°/)
    expect(await page.getByTestId('neph-run').isDisabled()).toBe(true)

    await page.locator('[data-field="opc-edges"]').fill('0.3, 0.4, 0.5, 0.65, 0.8, 1')
    await page.getByTestId('opc-index-typed').check()
    await page.locator('[data-field="opc-n"]').fill('1.59')
    await page.locator('[data-field="opc-k"]').fill('0')
    await page.getByTestId('opc-run').click()
    const edges = page.locator('[data-testid="rebin-edges"] tbody tr')
    await edges.first().waitFor({ timeout: 60_000 })
    expect(await edges.count()).toBe(6)
    for (let i = 0; i < 6; i++) {
      const cal = Number(await edges.nth(i).getAttribute('data-calibration'))
      const truth = Number(await edges.nth(i).getAttribute('data-true'))
      expect(Math.abs(truth / cal - 1)).toBeLessThan(1e-6)
      expect(await edges.nth(i).locator('td[data-col="true"]').textContent()).toBe(await edges.nth(i).locator('th').textContent())
    }
    expect(errors).toEqual([])
  })

  test('no request leaves the machine', () => {
    expect(requests.length).toBeGreaterThan(0)
    expect(requests.filter((u) => !isLocal(u))).toEqual([])
  })
})
