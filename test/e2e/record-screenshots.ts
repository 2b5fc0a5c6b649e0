// Screenshots of the station record (the invented three-day campaign of resources/field/campaign-*.csv) at
// 1366×768, light and dark, into resources/screenshots/record-*.png.
// Regenerate with:  npx tsx test/e2e/record-screenshots.ts   (needs Chromium, like the e2e tests)
import { join } from 'node:path'
import { buildAndServe, isLocal, launchChromium, ROOT } from './harness.ts'

const OUT = process.argv[2] ?? join(ROOT, 'resources', 'screenshots')
const FILES = ['campaign-mobility.csv', 'campaign-aerodynamic.csv', 'campaign-nephelometer.csv', 'campaign-absorption.csv'].map((n) => join(ROOT, 'resources', 'field', n))

async function main(): Promise<void> {
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
      page.setDefaultTimeout(120_000)
      await page.goto(served.url)
      await page.getByTestId('cautions-ok').click()
      await page.locator('.sample-item[data-sample="Quarry dust event"] button.sample-name').click()
      await page.locator('#tab-record').click()
      const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('record-add-files').click()])
      await chooser.setFiles(FILES)
      await page.getByTestId('record-density').fill('1.8')
      await page.getByTestId('record-density').press('Enter')
      await page.getByTestId('record-summary').waitFor()
      await page.getByTestId('record-from').fill('2026-07-15T13:00:00Z')
      await page.getByTestId('record-to').fill('2026-07-15T19:00:00Z')
      await page.getByTestId('record-mark').click()
      await page.waitForTimeout(300)
      await page.screenshot({ path: join(OUT, `record-files-${theme}.png`) })
      await page.evaluate(() => {
        const panel = document.getElementById('result-panel')
        const el = document.querySelector('[data-testid="record-stretch-problem"], .record-stretch')
        if (panel && el) panel.scrollTop += el.getBoundingClientRect().top - panel.getBoundingClientRect().top - 8
      })
      const box = (await page.locator('[data-chart="record-coefficients"] .u-over').boundingBox())!
      await page.mouse.move(box.x + box.width * 0.45, box.y + box.height / 2)
      await page.waitForTimeout(300)
      await page.screenshot({ path: join(OUT, `record-${theme}.png`) })
      await context.close()
    }
  } finally {
    await browser.close()
    await served.close()
  }
  if (outside.length > 0) throw new Error(`requests left the machine: ${outside.join(', ')}`)
}

await main()
