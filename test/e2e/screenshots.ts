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
      await page.getByTestId('report').click()
      await page.waitForTimeout(800)
      await page.screenshot({ path: join(OUT, `report-${theme}.png`) })
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
