// End-to-end: the first load of the web page logs no error in the browser console (it once logged a 404 for the
// page's icon), the page has its own icon, and a sample whose thin-layer forcing leaves its range shows the warning
// beside its verdict.
import { describe, expect, test } from 'vitest'
import { appSession } from './harness.ts'

const session = appSession()

describe('first load', { timeout: 120_000 }, () => {
  test('logs no console error and has the Motebench icon', async () => {
    const { page, errors, consoleErrors } = await session.open()
    expect(errors).toEqual([])
    expect(consoleErrors).toEqual([])
    const href = await page.locator('link[rel="icon"]').getAttribute('href')
    expect(href).toBeTruthy()
    // the icon loads: fetched from the page (a data: URL when the build inlined it, else the served file)
    const loaded = await page.evaluate(async (h) => {
      const r = await fetch(new URL(h!, document.baseURI).href)
      return { ok: r.ok, text: await r.text() }
    }, href)
    expect(loaded.ok).toBe(true)
    expect(loaded.text).toContain('<svg')
  })

  test('the humid sulfate–nitrate sample (τ ≈ 2) shows the thin-layer warning beside its verdict; the wood smoke (τ ≈ 0.1) none', async () => {
    const { page } = await session.open()
    await page.keyboard.press('Alt+4')
    await page.locator('[data-view="climate"]').waitFor()
    await page.locator('.sample-item', { hasText: 'Humid sulfate' }).click()
    const warning = page.getByTestId('warnings-forcing')
    await warning.waitFor({ timeout: 60_000 })
    expect(await warning.textContent()).toMatch(/Thin-layer forcing .* W m⁻² is outside its range.*Use the two-stream figure/)
    await page.locator('.sample-item', { hasText: 'Winter wood smoke' }).click()
    await page.locator('#result-panel[data-fresh="true"]').waitFor({ timeout: 60_000 })
    await page.locator('[data-testid="verdict"]').first().waitFor()
    expect(await page.getByTestId('warnings-forcing').count()).toBe(0)
  })

  test('no request leaves the machine', () => {
    expect(session.requests.length).toBeGreaterThan(0)
    expect(session.requests.filter((u) => !u.startsWith('data:') && !u.startsWith('blob:') && !/^http:\/\/127\.0\.0\.1:/.test(u))).toEqual([])
  })
})
