// End-to-end: the study's own components and modes with compositions of their own, in the web build of the app.
import type { Page } from 'playwright-core'
import { describe, expect, test } from 'vitest'
import { appSession, shownNumber } from './harness.ts'

const session = appSession()

async function openApp(): Promise<Page> {
  const { page, errors } = await session.open()
  expect(errors).toEqual([])
  return page
}

async function waitForResults(page: Page): Promise<void> {
  await page.locator('#result-panel[data-fresh="true"]').waitFor({ timeout: 60_000 })
}

async function sigmaAbs550(page: Page): Promise<number> {
  const cell = page.locator('[data-testid="optics-table"] tr[data-wavelength="550"] td[data-col="σabs"]')
  return shownNumber(await cell.textContent())
}

/** Adds a blank sample (one mode of ammonium sulfate) after the demo's five, selects it and waits for its results. */
async function addBlankSample(page: Page): Promise<number> {
  await expect.poll(() => page.locator('.sample-item').count()).toBe(5)
  await page.getByTestId('add-sample').click()
  await expect.poll(() => page.locator('.sample-item').count(), { timeout: 60_000 }).toBe(6)
  await page.locator('[data-path="samples[5].composition.components[0].material"]').waitFor()
  await waitForResults(page)
  return 5
}

/** Opens the study's own components and adds "Lab soot": density 1.8 g cm⁻³, m = 1.8 + 0.6i at every wavelength. */
async function addLabSoot(page: Page): Promise<void> {
    await page.locator('[data-testid="own-components"] > summary').click()
    await page.getByTestId('add-own-component').click()
    await page.locator('[data-path="user_materials[0].id"]').fill('lab-soot')
    await page.locator('[data-path="user_materials[0].name"]').fill('Lab soot')
    await page.locator('[data-path="user_materials[0].density_g_cm3"]').fill('1.8')
    await page.locator('[data-path="user_materials[0].index.n"]').fill('1.8')
    await page.locator('[data-path="user_materials[0].index.k"]').fill('0.6')
}

describe('own components and per-mode compositions', { timeout: 120_000 }, () => {
  test('an own constant-index component chosen for a sample changes σabs; a bad k is marked at its field', async () => {
    const page = await openApp()
    const i = await addBlankSample(page)
    const before = await sigmaAbs550(page)
    expect(Number.isFinite(before)).toBe(true)

    await addLabSoot(page)
    expect(await page.locator('[data-error-for^="user_materials[0]"]').count()).toBe(0)

    const component = page.locator(`[data-path="samples[${i}].composition.components[0].material"]`)
    expect(await component.locator('option[value="lab-soot"]').count()).toBe(1)
    await component.selectOption('lab-soot')
    await expect.poll(() => sigmaAbs550(page), { timeout: 60_000 }).not.toBe(before)
    await waitForResults(page)
    const after = await sigmaAbs550(page)
    expect(after).toBeGreaterThan(before)

    // k below 0 is refused by src-core's check, marked at the k field, and the document keeps the last good k
    await page.locator('[data-path="user_materials[0].index.k"]').fill('-1')
    const err = page.locator('[data-error-for="user_materials[0].index.k"]')
    await err.waitFor()
    expect(await err.textContent()).toMatch(/k = -1/)
    expect(await page.locator('[data-path="user_materials[0].index.k"]').getAttribute('aria-invalid')).toBe('true')
    expect(await sigmaAbs550(page)).toBe(after)
  })

  test('a mode with its own black-carbon composition absorbs more than the same mode of the sample’s sulfate', async () => {
    const page = await openApp()
    const i = await addBlankSample(page)
    // a second mode, made of the sample's (non-absorbing) ammonium sulfate
    await page.getByRole('button', { name: 'Add mode' }).click()
    await page.locator(`[data-path="samples[${i}].size.modes[1].gsd"]`).waitFor()
    await waitForResults(page)
    const shared = await sigmaAbs550(page)

    const madeOf = page.locator(`[data-path="samples[${i}].size.modes[1].composition"]`)
    expect(await madeOf.isChecked()).toBe(false)
    await madeOf.check()
    const own = page.locator(`[data-path="samples[${i}].size.modes[1].composition.components[0].material"]`)
    await own.waitFor()
    await own.selectOption('black-carbon')
    await expect.poll(() => sigmaAbs550(page), { timeout: 60_000 }).not.toBe(shared)
    await waitForResults(page)
    expect(await sigmaAbs550(page)).toBeGreaterThan(shared)
    // the sample's own composition is unchanged: the first mode is still sulfate
    expect(await page.locator(`[data-path="samples[${i}].composition.components[0].material"]`).inputValue()).toBe('ammonium-sulfate')

    // back to the sample's composition: σabs returns to the sulfate value
    await madeOf.uncheck()
    await expect.poll(() => sigmaAbs550(page), { timeout: 60_000 }).toBe(shared)
  })

  test('an own component given by expressions is computed by the workers, and at 550 nm equals the same index given as a constant', async () => {
    // The optics workers are built without the expression compiler and load it only for a study that has
    // expression components (vite.shared.ts); the figures must be those of the index the expressions give.
    const page = await openApp()
    const i = await addBlankSample(page)
    await addLabSoot(page)
    await page.locator(`[data-path="samples[${i}].composition.components[0].material"]`).selectOption('lab-soot')
    await waitForResults(page)
    const constant = await sigmaAbs550(page)
    const sigmaAbs450 = async () => shownNumber(await page.locator('[data-testid="optics-table"] tr[data-wavelength="450"] td[data-col="σabs"]').textContent())
    const constant450 = await sigmaAbs450()

    // k = 0.6 at 550 nm and larger at shorter wavelengths
    await page.locator('[data-path="user_materials[0].index.kind"]').selectOption('expression')
    await page.locator('[data-path="user_materials[0].index.n"]').fill('1.8')
    await page.locator('[data-path="user_materials[0].index.k"]').fill('0.6 * 550 / wl_nm')
    expect(await page.locator('[data-error-for^="user_materials"]').count()).toBe(0)
    await expect.poll(sigmaAbs450, { timeout: 60_000 }).not.toBe(constant450)
    await waitForResults(page)
    expect(await sigmaAbs550(page)).toBe(constant)
    expect(await sigmaAbs450()).not.toBe(constant450)
  })
})
