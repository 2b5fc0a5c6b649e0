import { createServer } from 'node:http'
import { readFile } from 'node:fs/promises'
import { extname, join } from 'node:path'
import { chromium } from 'playwright-core'
const dir = '/tmp/mb-web'
const types: Record<string, string> = { '.html': 'text/html', '.js': 'text/javascript', '.css': 'text/css', '.svg': 'image/svg+xml' }
const server = createServer((req, res) => {
  const p = new URL(req.url ?? '/', 'http://x').pathname
  const f = join(dir, p === '/' ? 'index.html' : decodeURIComponent(p))
  readFile(f).then((b) => res.writeHead(200, { 'content-type': types[extname(f)] ?? 'application/octet-stream' }).end(b), () => res.writeHead(404).end())
})
await new Promise<void>((ok) => server.listen(0, '127.0.0.1', ok))
const port = (server.address() as { port: number }).port
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--headless', '--no-sandbox', '--disable-gpu'] })
const page = await browser.newPage({ viewport: { width: 1366, height: 768 } })
page.on('pageerror', (e) => console.log('pageerror', e.message))
await page.goto(`http://127.0.0.1:${port}/`)
await page.getByTestId('cautions-ok').click()
await page.locator('#result-panel[data-fresh="true"]').waitFor({ timeout: 120_000 })
await page.screenshot({ path: '/tmp/shots/start.png' })
await page.locator('[data-path="samples[0].size.modes[1].gsd"]').fill('0.9')
await page.locator('[data-path="samples[0].size.modes[1].gsd"]').press('Tab')
await page.locator('[data-path="samples[0].size.modes[0].median_um"]').fill('1e9 nm')
await page.locator('[data-path="samples[0].size.modes[0].median_um"]').press('Tab')
await page.locator('[data-path="samples[0].size.modes[0].number_cm3"]').fill('1,5')
await page.waitForTimeout(1500)
await page.screenshot({ path: '/tmp/shots/bad.png' })
console.log(await page.locator('[data-status]').allTextContents())
await browser.close()
server.close()
