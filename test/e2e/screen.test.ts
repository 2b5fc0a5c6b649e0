// End-to-end: what the screen shows. Charts follow a theme switch, nothing is cut off at 1920 × 1080, figures
// without meaning are "—" with their reason, the compare map gives each sample its own zero line, and the counter
// re-binning draws its response curve.
import type { Page } from 'playwright-core'
import { describe, expect, test } from 'vitest'
import { appSession } from './harness.ts'
import { findClipped } from './clipping.ts'

const session = appSession()

/** Pixels of the chart's canvas whose colour is within 24 per channel of `hex` (drawn opaque enough to read). */
function pixelsOf(page: Page, chart: string, hex: string): Promise<number> {
  const code = `(() => {
    const c = document.querySelector('[data-chart="${chart}"] canvas')
    const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data
    const t = [${parseInt(hex.slice(1, 3), 16)}, ${parseInt(hex.slice(3, 5), 16)}, ${parseInt(hex.slice(5, 7), 16)}]
    let n = 0
    for (let i = 0; i < d.length; i += 4)
      if (d[i + 3] > 200 && Math.abs(d[i] - t[0]) < 24 && Math.abs(d[i + 1] - t[1]) < 24 && Math.abs(d[i + 2] - t[2]) < 24) n++
    return n
  })()`
  return page.evaluate(code) as Promise<number>
}

const LIGHT = { ink: '#14171a', grid: '#d7dbe0' } // styles.css, light theme
const DARK = { ink: '#eef1f4', grid: '#363d45' } // styles.css, dark theme

describe('what the screen shows', { timeout: 120_000 }, () => {
  test('a theme switch redraws the charts already drawn in the new theme’s ink and grid', async () => {
    const { page, errors } = await session.open()
    const chart = 'extinction-spectrum'
    await page.locator(`[data-chart="${chart}"] canvas`).waitFor()
    const start = (await page.evaluate(() => document.documentElement.dataset['theme'])) === 'dark' ? DARK : LIGHT
    const other = start === DARK ? LIGHT : DARK
    expect(await pixelsOf(page, chart, start.ink)).toBeGreaterThan(50) // tick labels
    await page.getByRole('button', { name: /Switch to the (dark|light) theme/ }).click()
    await expect.poll(() => pixelsOf(page, chart, other.ink), { timeout: 10_000 }).toBeGreaterThan(50)
    expect(await pixelsOf(page, chart, other.grid)).toBeGreaterThan(50) // grid lines
    expect(await pixelsOf(page, chart, start.ink)).toBe(0) // no tick label left in the old ink
    expect(errors).toEqual([])
  })

  test('nothing the user needs is cut off at 1920 × 1080 either, in any view', async () => {
    const { page, errors } = await session.open()
    await page.setViewportSize({ width: 1920, height: 1080 })
    for (let k = 1; k <= 9; k++) {
      await page.keyboard.press(`Alt+${k}`)
      await page.waitForTimeout(200)
      expect(await findClipped(page), `view ${k}`).toEqual([])
    }
    expect(errors).toEqual([])
  })

  test('figures without meaning are “—” with the reason, and the table’s symbols are defined', async () => {
    const { page, errors } = await session.open()
    const rows = page.locator('[data-testid="optics-table"] tbody tr')
    const n = await rows.count()
    let withheld = 0
    for (let i = 0; i < n; i++) {
      const row = rows.nth(i)
      const nm = Number(await row.getAttribute('data-wavelength'))
      const visible = nm >= 400 && nm <= 700 // Koschmieder's threshold is for visible light (common practice)
      for (const col of ['VR (km)', 'dv']) {
        const cell = row.locator(`td[data-col="${col}"]`)
        if (!visible) {
          expect(await cell.textContent()).toBe('—')
          expect(await cell.getAttribute('data-withheld')).toMatch(/visible light/)
          withheld++
        } else if (col === 'VR (km)') expect(Number(await cell.textContent())).toBeGreaterThan(0)
      }
      const dv = await row.locator('td[data-col="dv"]').textContent()
      if (dv !== '—') expect(Number(dv)).toBeGreaterThanOrEqual(0) // a haze index is never negative
      // the absorption exponent only where σabs ≥ 0.1 Mm⁻¹ and ≥ 1 % of σext at the wavelength
      const abs = Number(await row.locator('td[data-col="σabs"]').textContent())
      const ext = Number(await row.locator('td[data-col="σext"]').textContent())
      if (abs < 0.1 || abs < 0.01 * ext) expect(await row.locator('td[data-col="å abs"]').getAttribute('data-withheld')).toMatch(/σabs below/)
    }
    expect(withheld).toBeGreaterThan(0)
    expect(await page.getByTestId('withheld-notes').textContent()).toMatch(/VR \(km\): defined for visible light only \(400–700 nm\)/)
    const legend = (await page.getByTestId('symbol-legend').textContent()) ?? ''
    for (const sym of ['ω', 'g', 'b', 'β̄', 'å', 'MEE', 'MSE', 'MAE', 'τ', 'VR', 'dv']) expect(legend).toContain(sym)

    expect(errors).toEqual([])
  })

  test('the compare map draws each sample’s own zero line and marker, with a numeric colour scale', async () => {
    const { page, errors } = await session.open()
    const toggles = page.getByTestId('compare-toggle')
    for (const k of [0, 1, 3]) await toggles.nth(k).check()
    await page.locator('[data-tab="climate"]').click()
    await page.locator('#result-panel[data-fresh="true"]').waitFor({ timeout: 90_000 })
    const wrap = page.getByTestId('forcing-map-wrap')
    await expect.poll(async () => JSON.parse((await wrap.getAttribute('data-zero-lines')) ?? '[]').length, { timeout: 60_000 }).toBe(3)
    const lines = JSON.parse((await wrap.getAttribute('data-zero-lines')) ?? '[]') as {
      sample: string
      shape: string
      upscatter: number
      critical: number
      ssa: number
      verdict: string
      infrared: number | null
      net_points: number
      net_critical: number | null
    }[]
    // each line is its own sample's: its ω_crit at the sample's surface albedo is the one its verdict states
    const verdicts = page.getByTestId('verdict')
    expect(await verdicts.count()).toBe(3)
    for (let i = 0; i < 3; i++) {
      const text = (await verdicts.nth(i).getByTestId('ssa-vs-crit').textContent()) ?? ''
      const crit = Number(text.split(/[<>=]/)[1].trim())
      expect(Math.abs(lines[i].critical - crit), lines[i].sample).toBeLessThan(0.002)
      // and the marker's side of its own line is its verdict (ω above ω_crit cools: Chylek & Wong 1995)
      if (lines[i].verdict !== 'too close to call') expect(lines[i].ssa > lines[i].critical ? 'cools' : 'warms').toBe(lines[i].verdict)
      // each compared sample's net zero line (sunlight + its infrared part) is drawn as well; the verdict rests on the
      // net, so the marker's side of that line is the verdict, and an infrared part that warms moves the line to a
      // higher ω (more sunlight cooling is needed to offset it: the thin-layer forcing falls as ω rises, Chylek & Wong 1995)
      const infrared = lines[i].infrared
      if (infrared === null) continue
      expect(lines[i].net_points, lines[i].sample).toBeGreaterThan(1)
      const net = lines[i].net_critical
      if (net === null) continue
      if (lines[i].verdict !== 'too close to call') expect(lines[i].ssa > net ? 'cools' : 'warms', lines[i].sample).toBe(lines[i].verdict)
      if (infrared > 0.01) expect(net, lines[i].sample).toBeGreaterThan(lines[i].critical)
    }
    expect(lines.filter((l) => l.net_critical !== null).length).toBeGreaterThanOrEqual(2)
    expect((await page.locator('[data-chart="forcing-map"] .u-legend').textContent()) ?? '').toMatch(/net zero line dotted \(infrared [+−]/)
    expect(new Set(lines.map((l) => l.shape)).size).toBe(3)
    expect(new Set(lines.map((l) => l.upscatter)).size).toBe(3) // their own β̄, so their own lines
    expect(await page.locator('[data-chart="forcing-map"] .u-legend .u-series').count()).toBeGreaterThanOrEqual(3)
    expect(await page.locator('[data-chart="forcing-map"] .chart-title').textContent()).toMatch(/shading for “.+”, a zero line for each sample/)
    // the colour scale in W m⁻², symmetric about zero, with minus signs
    const scale = page.getByTestId('map-scale')
    expect(Number(await scale.getAttribute('data-max'))).toBeGreaterThan(0)
    expect(await scale.textContent()).toMatch(/^−[\d.]+.*0.*\+[\d.]+.*W m⁻²/s)
    // the verdict says which figure it rests on
    expect(await page.getByTestId('verdict-basis').first().textContent()).toMatch(/rests on the net forcing.*thin-layer forcing with global-mean sunlight.*thermal-infrared part.*daily mean at the site/s)
    expect(errors).toEqual([])
  })

  test('the counter re-binning draws its response curve with the bin edges', async () => {
    const { page, errors } = await session.open()
    await page.locator('[data-tab="instruments"]').click()
    await page.locator('[data-field="opc-edges"]').fill('0.3, 0.5, 0.8, 1.2, 2')
    await page.getByTestId('opc-index-typed').check()
    await page.locator('[data-field="opc-n"]').fill('1.45')
    await page.locator('[data-field="opc-k"]').fill('0')
    await page.getByTestId('opc-run').click()
    const curve = page.getByTestId('opc-response')
    await curve.waitFor({ timeout: 90_000 })
    expect(Number(await curve.getAttribute('data-points'))).toBeGreaterThan(100)
    expect(Number(await curve.getAttribute('data-edges'))).toBe(5)
    expect(await page.locator('[data-chart="opc-response"] .u-legend .u-series').count()).toBeGreaterThanOrEqual(3)
    expect(await page.locator('[data-chart="opc-response"] [data-chart-axes]').textContent()).toMatch(/R\(D\), relative \(log scale\) against Diameter \(µm\) \(log scale\)/)
    // the curves were drawn: the canvas holds both lines' colours
    expect(await pixelsOf(page, 'opc-response', '#0060a0') + (await pixelsOf(page, 'opc-response', '#56b4e9'))).toBeGreaterThan(50)
    expect(errors).toEqual([])
  })
})
