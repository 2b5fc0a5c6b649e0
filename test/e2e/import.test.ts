// End-to-end: the sizer import dialog in the web build (headless Chromium): the choices a file leaves open,
// the preview of what will be read, and the mean over a time range as the imported bins.
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { appSession, ROOT } from './harness.ts'

let scratch: string
const session = appSession()

beforeAll(async () => {
  scratch = await mkdtemp(join(tmpdir(), 'motebench-e2e-import-'))
})
afterAll(async () => {
  if (scratch) await rm(scratch, { recursive: true, force: true })
})

async function openApp(): Promise<Page> {
  const { page, errors } = await session.open({ wait: false })
  expect(errors).toEqual([])
  return page
}

async function importFile(page: Page, path: string): Promise<void> {
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('import-sizer').click()])
  await chooser.setFiles(path)
  await page.locator('[data-dialog="sizer"]').waitFor()
}

const text = (page: Page, id: string) => page.getByTestId(id).textContent()

describe('sizer import dialog', { timeout: 90_000 }, () => {
  test('a file that does not state its diameter unit gets a unit choice, and imports once it is chosen', async () => {
    const page = await openApp()
    // 10 bins from 10 to 500: too few for a mobility sizer, too large for µm, so the unit is not inferred
    const d = Array.from({ length: 10 }, (_, j) => Number((10 * 50 ** (j / 9)).toPrecision(3)))
    const path = join(scratch, 'no-unit.csv')
    await writeFile(path, `quantity: dN/dlogDp\ntime,${d.join(',')}\n2024-05-01T00:00:00Z,${d.map(() => 100).join(',')}\n`)
    await importFile(page, path)
    expect(await text(page, 'sizer-problem')).toMatch(/diameter unit/)
    expect(await page.getByTestId('sizer-apply').isDisabled()).toBe(true)
    await page.getByTestId('sizer-unit').selectOption('nm')
    await page.getByTestId('sizer-preview').waitFor()
    expect(await text(page, 'preview-bins')).toMatch(/10 bins, 10 nm – 500 nm/)
    await page.getByTestId('sizer-apply').click()
    await page.getByTestId('bins-panel').waitFor()
    expect(await page.locator('.sample-item').count()).toBe(6)
    expect(await text(page, 'bins-panel')).toMatch(/10 measured bins/)
  })

  test('the preview shows the bins, rows, time range, ignored columns and rows left out; negatives can be set to 0', async () => {
    const page = await openApp()
    await importFile(page, join(ROOT, 'resources', 'field-valley-sizer.txt'))
    expect(await text(page, 'preview-bins')).toMatch(/32 bins, 12 nm – 480 nm \(midpoints\), values as dN\/dlogDp/)
    expect(await text(page, 'preview-rows')).toMatch(/20 read, 4 left out/)
    expect(await text(page, 'preview-time')).toMatch(/2024-03-14T23:00:00 to 2024-03-15T00:50:00.*day\/month\/year/)
    expect(await text(page, 'preview-ignored')).toMatch(/“Sample #” \(column 1\).*“Total Conc\. \(#\/cm3\)”/)
    expect(await page.getByTestId('preview-left-out').locator('li').count()).toBe(5)
    expect(await text(page, 'preview-left-out')).toMatch(/line 10, column 4: the value -4\.2 .* negative/)
    await page.getByTestId('sizer-negatives-zero').check()
    await expect.poll(() => text(page, 'preview-rows')).toMatch(/24 read; negatives set to 0: 5 cells in 4 rows/)
    expect(await text(page, 'sizer-range-count')).toBe('24 rows')
    await page.locator('[data-dialog="sizer"]').screenshot({ path: join(scratch, 'sizer-dialog.png') })
    if (process.env.MOTEBENCH_SHOT_DIR) await page.locator('[data-dialog="sizer"]').screenshot({ path: join(process.env.MOTEBENCH_SHOT_DIR, 'sizer-dialog.png') })
  })

  test('the mean over a chosen time range becomes the bins, with the count of rows averaged', async () => {
    const page = await openApp()
    const path = join(ROOT, 'resources', 'field-ridge-counter.csv')
    await importFile(page, path)
    await page.getByTestId('sizer-from').fill('2024-03-14T23:10:00+01:00')
    await page.getByTestId('sizer-to').fill('2024-03-14T23:20:00+01:00')
    await expect.poll(() => text(page, 'sizer-range-count')).toBe('3 rows')
    await page.getByTestId('sizer-apply').click()
    await page.getByTestId('bins-panel').waitFor()
    expect(await text(page, 'bins-panel')).toMatch(/16 measured bins.*the mean of 3 rows/)
    // the expected mean, from the file's own lines (23:10, 23:15, 23:20; decimal commas)
    const rows = (await readFile(path, 'utf8')).split('\n').filter((l) => /^2024-03-14T23:(10|15|20)/.test(l))
    expect(rows).toHaveLength(3)
    const cells = rows.map((l) => l.split(';').slice(1, 17).map((c) => Number(c.replace(',', '.'))))
    const mean = cells[0].map((_, j) => (cells[0][j] + cells[1][j] + cells[2][j]) / 3)
    const shown = await page.locator('[data-testid="bins-panel"] tbody tr td:nth-child(2)').allTextContents()
    expect(shown).toHaveLength(16)
    // the panel shows 5 significant digits
    shown.forEach((s, j) => expect(Math.abs(Number(s) / mean[j] - 1)).toBeLessThan(1e-4))
  })
  test('a file that records the humidity gives the new sample the mean over the rows taken, or, unticked, the sample keeps its own', async () => {
    const page = await openApp()
    // an invented mobility sizer export: 4 rows at 5 min with a humidity column (one cell outside 0–100 %)
    const d = [20, 40, 80, 160, 320]
    const rows = ['62', '64', '130', '66'].map((rh, i) => `2024-05-01T00:${String(5 * i).padStart(2, '0')}:00Z,${rh},${d.map((x) => 1000 + 10 * i + x).join(',')}`)
    const path = join(scratch, 'with-rh.csv')
    await writeFile(path, `units: nm\nquantity: dN/dlogDp\ntime,RH (%),${d.join(',')}\n${rows.join('\n')}\n`)
    const samples = await page.locator('.sample-item').count()
    await importFile(page, path)
    // 62, 64 and 66 are kept (130 % is left out, listed with its line): mean 64 over 3 of the 4 rows
    expect(await text(page, 'sizer-rh')).toBe('64 %')
    expect(await text(page, 'sizer-humidity')).toMatch(/“RH \(%\)” \(column 2\).*3 of the rows taken/)
    expect(await text(page, 'sizer-rh-left-out')).toMatch(/line 6, column 2: the relative humidity 130 % is outside 0–100 %/)
    // the first two rows only: mean 63
    await page.getByTestId('sizer-to').fill('2024-05-01T00:05:00Z')
    await expect.poll(() => text(page, 'sizer-rh')).toBe('63 %')
    await page.getByTestId('sizer-apply').click()
    await page.getByTestId('bins-panel').waitFor()
    const field = page.locator('[data-path$=".rh_percent"]').first()
    expect(await field.inputValue()).toBe('63')
    // again, all rows (64 % recorded) but unticked: the new sample keeps the selected one's 63 %
    await importFile(page, path)
    expect(await text(page, 'sizer-rh')).toBe('64 %')
    await page.getByTestId('sizer-use-rh').uncheck()
    if (process.env.MOTEBENCH_SHOT) await page.screenshot({ path: process.env.MOTEBENCH_SHOT })
    await page.getByTestId('sizer-apply').click()
    await expect.poll(() => page.locator('.sample-item').count()).toBe(samples + 2)
    expect(await field.inputValue()).toBe('63')
  })
})
