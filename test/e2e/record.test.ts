// End-to-end: the station record in the web build (headless Chromium) with the invented three-day campaign of
// resources/field/campaign-*.csv (test/field/make-campaign-files.ts): adding the files shows their summaries,
// the charts draw the record's figures (read from the plotted data), a marked stretch becomes a sample whose mean
// distribution is the mean of those rows, the CSV export is the record, and a study whose files cannot be opened
// by path says so with the old path; when the partner worker that reads the measured files fails, the record worker
// reads them itself and the record is the same.
import { readFileSync } from 'node:fs'
import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { describe, expect, test } from 'vitest'
import { buildCampaignRecord, demoStudy, recordCsv, recordSeries, stretchSample, type CampaignInput } from '../../src-core/index.ts'
import { appSession, isLocal, ROOT } from './harness.ts'
import { findClipped } from './clipping.ts'

const session = appSession()
const FILES = ['campaign-mobility.csv', 'campaign-aerodynamic.csv', 'campaign-nephelometer.csv', 'campaign-absorption.csv']
const path = (n: string) => join(ROOT, 'resources', 'field', n)

async function openRecord(): Promise<Page> {
  const { page, errors } = await session.open({ wait: false })
  expect(errors).toEqual([])
  await page.locator('#tab-record').click()
  await page.locator('[data-view="record"]').waitFor()
  return page
}

async function addCampaign(page: Page): Promise<void> {
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('record-add-files').click()])
  await chooser.setFiles(FILES.map(path))
  await page.getByTestId('record-file').nth(3).waitFor()
}

/**
 * Wraps the page's Worker before the view starts any: counts the workers started, by name (`window.started`), and
 * starts the one named `failing` as a worker that throws on its first message, counting its errors (`window.failures`).
 */
async function watchWorkers(page: Page, failing?: string): Promise<void> {
  await page.evaluate((failing) => {
    const w = window as unknown as { Worker: typeof Worker; started: Record<string, number>; failures: number }
    const Real = w.Worker
    w.started = {}
    w.failures = 0
    w.Worker = class extends Real {
      constructor(url: string | URL, options?: WorkerOptions) {
        const name = options?.name ?? ''
        w.started[name] = (w.started[name] ?? 0) + 1
        if (name !== failing) {
          super(url, options)
          return
        }
        super(URL.createObjectURL(new Blob(["self.onmessage = () => { throw new Error('the worker failed (test)') }"], { type: 'text/javascript' })))
        this.addEventListener('error', () => w.failures++)
      }
    }
  }, failing)
}

/** The same record computed here from the same files, for the checks (src-core, as the page runs it). */
function expected() {
  const kinds: CampaignInput['kind'][] = ['mobility', 'aerodynamic', 'scattering', 'absorption']
  const inputs = FILES.map((n, i) => ({ kind: kinds[i], name: n, text: readFileSync(path(n), 'utf8') }))
  return buildCampaignRecord(inputs, { files: [], sample: demoStudy().samples[0].name, wavelength_nm: 550, density_g_cm3: 1.8, shape_factor: 1 }, demoStudy()).record!
}

describe('station record', { timeout: 180_000 }, () => {
  test('adding the files shows their summaries; the record draws; a marked stretch becomes a sample of the mean of its rows', async () => {
    const page = await openRecord()
    await addCampaign(page)
    const kinds = await page.getByTestId('record-file').evaluateAll((els) => els.map((e) => e.getAttribute('data-kind')))
    expect(kinds).toEqual(['mobility', 'aerodynamic', 'scattering', 'absorption'])
    // the aerodynamic sizer needs the density: said, not guessed
    await page.getByTestId('record-problem').waitFor()
    expect(await page.getByTestId('record-problem').textContent()).toMatch(/aerodynamic sizer needs the particle density/)
    await page.getByTestId('record-density').fill('1.8')
    await page.getByTestId('record-density').press('Enter')
    await page.getByTestId('record-summary').waitFor({ timeout: 120_000 })
    // the summaries, as make-campaign-files.ts wrote the files: 846 lines of the mobility file, 2 bad rows, 2 h off
    const summaries = page.getByTestId('record-file-summary')
    expect(await summaries.nth(0).getByTestId('record-file-rows').textContent()).toBe('838 rows, 62 bins')
    expect(await summaries.nth(0).getByTestId('record-file-left-out').textContent()).toBe('2 rows left out')
    expect(await summaries.nth(0).getByTestId('record-file-time').textContent()).toBe('2026-07-14T00:00:20Z to 2026-07-16T23:55:20Z, every 5 min')
    expect(await summaries.nth(2).getByTestId('record-file-rows').textContent()).toMatch(/^863 rows, scattering 450 nm/)
    expect(await summaries.nth(3).getByTestId('record-file-left-out').textContent()).toBe('1 row left out')
    const summary = await page.getByTestId('record-summary').textContent()
    expect(summary).toMatch(/864 rows from 2026-07-14T00:00:00Z to 2026-07-16T23:55:00Z, 103 bins, 838 with a distribution, 26 gap rows \(only aerodynamic had data\)/)

    // the charts draw the record: the coefficients chart's σext is the record's, null in the gap
    const ref = expected()
    const plotted = await page.locator('[data-chart="record-coefficients"]').evaluate((el) => (el as unknown as { plotted: { x: number[]; series: { label: string; values: (number | null)[] }[] } }).plotted)
    expect(plotted.series.map((s) => s.label)).toEqual(['σext 550 nm', 'σsca 550 nm', 'σabs 550 nm', 'σsca measured 550 nm', 'σabs measured, at 550 nm'])
    const w = ref.columns.length
    const ext = ref.columns.indexOf('ext_550nm_Mm-1')
    let compared = 0
    plotted.x.forEach((x, i) => {
      const row = ref.times.indexOf(x * 1000)
      if (row < 0) return expect(plotted.series[0].values[i]).toBeNull() // a break drawn in a gap
      if (!ref.present[row]) return expect(plotted.series[0].values[i]).toBeNull()
      // the page's Math (Chromium) and this process's (Node) may differ in the last bits of the kernels
      expect(plotted.series[0].values[i]! / ref.cells[row * w + ext]).toBeCloseTo(1, 12)
      compared++
    })
    expect(compared).toBe(838)
    expect(await page.locator('[data-chart="record-size"] canvas').count()).toBe(1)
    expect(await page.getByTestId('record-colour-legend').textContent()).toMatch(/log scale/)

    // hover read-out
    await page.locator('[data-chart="record-coefficients"]').scrollIntoViewIfNeeded()
    const box = (await page.locator('[data-chart="record-coefficients"] .u-over').boundingBox())!
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height / 2)
    await expect.poll(() => page.getByTestId('record-readout').textContent()).toMatch(/σext 550 nm.*Mm⁻¹.*ω/)

    // Shift+drag pans: the range moves by the dragged share of the width, keeps its span, and marks nothing
    const stack = page.getByTestId('record-stack')
    const range = async () => stack.evaluate((el) => [Number((el as HTMLElement).dataset['from']), Number((el as HTMLElement).dataset['to'])])
    await stack.focus()
    for (let i = 0; i < 3; i++) await page.keyboard.press('+')
    const zoomed = await range()
    await page.keyboard.down('Shift')
    await page.mouse.move(box.x + box.width * 0.6, box.y + box.height / 2)
    await page.mouse.down()
    await page.mouse.move(box.x + box.width * 0.45, box.y + box.height / 2, { steps: 4 })
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height / 2, { steps: 4 })
    await page.mouse.up()
    await page.keyboard.up('Shift')
    await expect.poll(async () => (await range())[0]).toBeGreaterThan(zoomed[0])
    const panned = await range()
    const span = zoomed[1] - zoomed[0]
    expect((panned[1] - panned[0]) / span).toBeCloseTo(1, 9)
    // dragged left by 30 % of the plot's width: later by 30 % of the span (the plot area is the .u-over box)
    expect((panned[0] - zoomed[0]) / span).toBeCloseTo(0.3, 2)
    expect(await page.getByTestId('record-make-sample').isDisabled()).toBe(true)
    // two wheel steps towards the reader zoom in by 0.8 each around the pointer (drawn once a frame, added up)
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height / 2)
    await page.mouse.wheel(0, -100)
    await page.mouse.wheel(0, -100)
    await expect.poll(async () => { const r = await range(); return Number(((r[1] - r[0]) / span).toFixed(3)) }).toBe(0.64)
    // once the zooming settles, every chart (those out of view too) shows that range, its lines at their own width
    // (they are drawn thinner, and charts out of view are left, while it goes on)
    await expect.poll(() => stack.evaluate((el) => (el as HTMLElement).dataset['settled'])).toBe('true')
    const settled = await range()
    const drawn = await page.locator('.record-chart').evaluateAll((figs) => figs.map((f) => (f as unknown as { drawn: () => { x: number[]; widths: number[]; join: string | null } }).drawn()))
    expect(drawn.length).toBe(6)
    // lines at their widths, and uPlot's round joins drawn bevelled (charts/bevelJoins.ts) on every chart of lines
    for (const d of drawn) expect(d).toEqual({ x: settled, widths: d.widths.map(() => 1.6), join: d.widths.length ? 'bevel' : null })
    expect(drawn.reduce((n, d) => n + d.widths.length, 0)).toBe(12) // 5 + 2 + 2 + 1 + 2 lines, none on the map
    await page.keyboard.press('Home')

    // a typed stretch on the first afternoon: the sample's bins are the mean of those rows
    const from = '2026-07-14T12:00:00Z'
    const to = '2026-07-14T14:00:00Z'
    await page.getByTestId('record-from').fill(from)
    await page.getByTestId('record-to').fill(to)
    await page.getByTestId('record-mark').click()
    await page.getByTestId('record-make-sample').click()
    await page.getByTestId('bins-panel').waitFor()
    const name = `${'2026-07-14T12:00:00Z'}/${'2026-07-14T14:00:00Z'}`
    expect(await page.locator('.sample-item', { hasText: name }).count()).toBe(1)
    // the mean of the rows, independently: the stretch's rows of the record summed here
    const [a, b] = [Date.parse(from), Date.parse(to)]
    const rows = [...ref.times.keys()].filter((k) => ref.present[k] && ref.times[k] >= a && ref.times[k] <= b)
    expect(rows.length).toBe(25)
    const mean = Array.from({ length: ref.bins }, (_, j) => rows.reduce((s, k) => s + ref.values[k * ref.bins + j], 0) / rows.length)
    expect(stretchSample(ref, a, b).sample.size).toMatchObject({ kind: 'bins' })
    // the sample as the page keeps it: read back from the saved study (the web page downloads it)
    const [download] = await Promise.all([page.waitForEvent('download'), page.keyboard.press('Control+s')])
    const saved = JSON.parse(await readFile((await download.path())!, 'utf8'))
    const made = saved.samples.find((s: { name: string }) => s.name === name)
    expect(made.size.bins.rows_averaged).toBe(25)
    made.size.bins.values.forEach((v: number, j: number) => expect(v).toBeCloseTo(mean[j], 6))
    expect(made.size.bins.spread.length).toBe(ref.bins)
    expect(made.size.bins.source).toMatch(/campaign-mobility\.csv .* mean of 25 rows 2026-07-14T12:00:00Z\/2026-07-14T14:00:00Z/)
    expect(saved.campaign.files.map((f: { path: string }) => f.path)).toEqual(FILES)
    // the new sample computes like any other
    await page.locator('#result-panel[data-fresh="true"]').waitFor({ timeout: 60_000 })
  })

  test('the CSV export is the record; a stretch without data says so', async () => {
    const page = await openRecord()
    await addCampaign(page)
    await page.getByTestId('record-density').fill('1.8')
    await page.getByTestId('record-density').press('Enter')
    await page.getByTestId('record-summary').waitFor({ timeout: 120_000 })
    // at 1366 × 768 nothing of the view is cut off (test/e2e/clipping.ts)
    expect(await findClipped(page)).toEqual([])
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('record-csv').click()])
    const text = await readFile((await download.path())!, 'utf8')
    expect(text).toBe(recordCsv(expected()))
    // the charts as one PNG picture
    const [png] = await Promise.all([page.waitForEvent('download'), page.getByTestId('record-png').click()])
    expect(png.suggestedFilename()).toMatch(/-record\.png$/)
    const bytes = await readFile((await png.path())!)
    expect(bytes.subarray(1, 4).toString('latin1')).toBe('PNG')
    expect(bytes.readUInt32BE(20)).toBeGreaterThan(bytes.readUInt32BE(16)) // taller than wide: the stacked charts
    // the mobility sizer's outage: no distribution, no sample
    await page.getByTestId('record-from').fill('2026-07-15T06:10:00Z')
    await page.getByTestId('record-to').fill('2026-07-15T07:00:00Z')
    await page.getByTestId('record-mark').click()
    await page.getByTestId('record-make-sample').click()
    expect(await page.getByTestId('record-stretch-problem').textContent()).toMatch(/are gaps without a distribution/)
  })

  test('a study whose files cannot be opened by their path names each with its old path and a way to point at it', async () => {
    const page = await openRecord()
    await addCampaign(page)
    await page.getByTestId('record-density').fill('1.8')
    await page.getByTestId('record-density').press('Enter')
    await page.getByTestId('record-summary').waitFor({ timeout: 120_000 })
    const [download] = await Promise.all([page.waitForEvent('download'), page.keyboard.press('Control+s')])
    const text = await readFile((await download.path())!, 'utf8')
    // open the saved study in a fresh page: the web page cannot read files by path
    const fresh = await openRecord()
    // the header's Open button: a click is the user's gesture the file chooser needs (the keyboard shortcut's
    // key press, sent while the fresh page was still busy on a loaded machine, once opened no chooser in CI)
    const [chooser] = await Promise.all([fresh.waitForEvent('filechooser'), fresh.getByTestId('open').click()])
    const file = join(ROOT, 'node_modules', '.motebench-e2e-record.mote')
    await import('node:fs/promises').then((fs) => fs.writeFile(file, text))
    await chooser.setFiles(file)
    await fresh.locator('#tab-record').click()
    await fresh.getByTestId('record-file-missing').first().waitFor()
    expect(await fresh.getByTestId('record-file-missing').count()).toBe(4)
    expect(await fresh.getByTestId('record-file-missing').first().textContent()).toMatch(/Not found: campaign-mobility\.csv \(a web page cannot open a file by its path\)/)
    const [again] = await Promise.all([fresh.waitForEvent('filechooser'), fresh.getByTestId('record-point-again').first().click()])
    await again.setFiles(path('campaign-mobility.csv'))
    await expect.poll(() => fresh.getByTestId('record-file-missing').count()).toBe(3)
    await import('node:fs/promises').then((fs) => fs.rm(file, { force: true }))
  })

  test('when the partner worker fails, the record worker reads the measured files from their blobs: the same record', async () => {
    const { page } = await session.open({ wait: false })
    // the partner (reader.ts, the worker named motebench-reader) replaced, before the view starts it, by one that
    // fails on the first file it is sent, as a fault in its reading would
    await watchWorkers(page, 'motebench-reader')
    await page.locator('#tab-record').click()
    await page.locator('[data-view="record"]').waitFor()
    await addCampaign(page)
    await page.getByTestId('record-density').fill('1.8')
    await page.getByTestId('record-density').press('Enter')
    await page.getByTestId('record-summary').waitFor({ timeout: 120_000 })
    // the partner was sent a measured file and failed (so this record's measured files were not its reading)
    expect(await page.evaluate(() => (window as unknown as { failures: number }).failures)).toBeGreaterThan(0)
    // the measured files' summaries, as in the first test
    const summaries = page.getByTestId('record-file-summary')
    expect(await summaries.nth(2).getByTestId('record-file-rows').textContent()).toMatch(/^863 rows, scattering 450 nm/)
    expect(await summaries.nth(3).getByTestId('record-file-left-out').textContent()).toBe('1 row left out')
    // the coefficients chart's measured lines are the record's measured figures computed here from the texts
    const want = recordSeries(expected())
    const plotted = await page.locator('[data-chart="record-coefficients"]').evaluate((el) => (el as unknown as { plotted: { x: number[]; series: { label: string; values: (number | null)[] }[] } }).plotted)
    expect(plotted.x).toEqual(want.x)
    let compared = 0
    for (const [label, key] of [['σsca measured 550 nm', 'sca_meas'], ['σabs measured, at 550 nm', 'abs_meas']] as const) {
      const got = plotted.series.find((s) => s.label === label)!.values
      got.forEach((v, i) => {
        const w = want.values[key][i]
        if (w === null) return expect(v).toBeNull()
        // the absorption carried to 550 nm by its Ångström exponent: the page's Math and Node's may differ in the last bits
        expect(v! / w).toBeCloseTo(1, 12)
        compared++
      })
    }
    expect(compared).toBeGreaterThan(1500) // both lines, nearly every row of the three days
  })

  test('a changed parameter is computed by the worker that holds the files, which it reads no more than once: the record at the new wavelength', async () => {
    const { page } = await session.open({ wait: false })
    // the record workers the page starts, counted (worker.ts keeps what it read for the next record, so the page
    // keeps a worker whose record is done for the next one: session.ts, keepFinishedWorker)
    await watchWorkers(page)
    await page.locator('#tab-record').click()
    await page.locator('[data-view="record"]').waitFor()
    // one sizer (its rows go to the page with the record, so the worker reads them again from the bytes it keeps)
    const files = ['campaign-mobility.csv', 'campaign-nephelometer.csv']
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('record-add-files').click()])
    await chooser.setFiles(files.map(path))
    await page.getByTestId('record-summary').waitFor({ timeout: 120_000 })
    const csvAt = async () => {
      const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('record-csv').click()])
      return readFile((await download.path())!, 'utf8')
    }
    const inputs: CampaignInput[] = [{ kind: 'mobility', name: files[0], text: readFileSync(path(files[0]), 'utf8') }, { kind: 'scattering', name: files[1], text: readFileSync(path(files[1]), 'utf8') }]
    const want = (wavelength_nm: number) => recordCsv(buildCampaignRecord(inputs, { files: [], sample: demoStudy().samples[0].name, wavelength_nm, shape_factor: 1 }, demoStudy()).record!)
    expect(await csvAt()).toBe(want(550))
    for (const wl of [700, 450]) {
      await page.getByTestId('record-wavelength').fill(String(wl))
      await page.getByTestId('record-wavelength').press('Enter')
      await expect.poll(async () => (await page.locator('[data-chart="record-coefficients"]').evaluate((el) => (el as unknown as { plotted: { series: { label: string }[] } }).plotted.series[0].label)), { timeout: 120_000 }).toBe(`σext ${wl} nm`)
      expect(await csvAt()).toBe(want(wl))
      // the measured file's summary as a first record's: the note each record adds is there once, not once a record
      expect((await page.getByTestId('record-file-summary').nth(1).textContent())!.match(/records inside the record's rows/g)?.length).toBe(1)
    }
    expect(await page.evaluate(() => (window as unknown as { started: Record<string, number> }).started['motebench-record'])).toBe(1)
  })

  test('no request leaves the machine', () => {
    expect(session.requests.length).toBeGreaterThan(0)
    expect(session.requests.filter((u) => !isLocal(u))).toEqual([])
  })
})
