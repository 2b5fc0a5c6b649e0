// Shared by the end-to-end tests and the screenshot script: builds the web page into a temporary folder, serves it
// on 127.0.0.1 (a free port) and starts headless Chromium. Nothing is fetched from the network.
import { createServer, type Server } from 'node:http'
import { existsSync } from 'node:fs'
import { mkdtemp, readFile, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { extname, join, normalize, resolve } from 'node:path'
import type { AddressInfo } from 'node:net'
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core'
import { afterAll, afterEach, beforeAll } from 'vitest'

export const ROOT = resolve(import.meta.dirname, '../..')
export const CHROMIUM = process.env['CHROMIUM_PATH'] ?? '/usr/bin/chromium'

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.woff2': 'font/woff2'
}

export interface Served {
  url: string
  close(): Promise<void>
}

/** vite build of the web page (vite.web.config.ts) into a temporary folder, served by a tiny static server. */
export async function buildAndServe(): Promise<Served> {
  const dir = await mkdtemp(join(tmpdir(), 'motebench-e2e-'))
  const { build } = await import('vite')
  await build({
    configFile: join(ROOT, 'vite.web.config.ts'),
    logLevel: 'error',
    build: { outDir: dir, emptyOutDir: true, minify: false, reportCompressedSize: false }
  })
  const server: Server = createServer((req, res) => {
    const path = decodeURIComponent(new URL(req.url ?? '/', 'http://x').pathname)
    const file = normalize(join(dir, path === '/' ? 'index.html' : path))
    if (!file.startsWith(dir)) {
      res.writeHead(403).end()
      return
    }
    readFile(file).then(
      (body) => res.writeHead(200, { 'content-type': TYPES[extname(file)] ?? 'application/octet-stream', 'cache-control': 'no-store' }).end(body),
      () => res.writeHead(404).end('not found')
    )
  })
  await new Promise<void>((ok) => server.listen(0, '127.0.0.1', ok))
  const { port } = server.address() as AddressInfo
  return {
    url: `http://127.0.0.1:${port}/`,
    async close() {
      await new Promise<void>((ok) => server.close(() => ok()))
      await rm(dir, { recursive: true, force: true })
    }
  }
}

/** Headless Chromium; fails with a clear message where it is not installed (CI installs it). */
export async function launchChromium(): Promise<Browser> {
  if (!existsSync(CHROMIUM)) {
    throw new Error(
      `Chromium was not found at ${CHROMIUM}. The end-to-end tests need it: install Debian's chromium (apt-get install chromium), ` +
        'or set CHROMIUM_PATH to a Chromium binary. (.ci/run installs it when missing.)'
    )
  }
  return chromium.launch({
    executablePath: CHROMIUM,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run']
  })
}

/** True for the addresses the app may load from: the local server, data: and blob: URLs. */
export function isLocal(url: string): boolean {
  if (url.startsWith('data:') || url.startsWith('blob:')) return true
  try {
    const u = new URL(url)
    return u.hostname === '127.0.0.1' || u.hostname === 'localhost'
  } catch {
    return false
  }
}

/**
 * The shared set-up of an end-to-end test file: one build, server and browser for the file (hooks registered
 * here), a fresh browser context per `open()` closed after each test, and every request URL recorded.
 */
export function appSession(): {
  open: (o?: { keepCautions?: boolean; wait?: boolean }) => Promise<{ page: Page; errors: string[]; consoleErrors: string[] }>
  requests: string[]
  url: () => string
} {
  let served: Served | undefined
  let browser: Browser | undefined
  const requests: string[] = []
  const contexts: BrowserContext[] = []
  beforeAll(async () => {
    browser = await launchChromium()
    served = await buildAndServe()
  }, Number(process.env['MOTEBENCH_E2E_SETUP_MS'] ?? 420_000)) // the build takes minutes on a busy machine
  // Close each test's pages, so that their workers stop computing and leave the CPU to the next test.
  afterEach(async () => {
    for (const c of contexts.splice(0)) await c.close().catch(() => {})
  })
  afterAll(async () => {
    await browser?.close()
    await served?.close()
  })
  /** The app in a fresh profile on the demo study; unless told otherwise, cautions dismissed and results computed. */
  const open = async (o: { keepCautions?: boolean; wait?: boolean } = {}) => {
    const context = await browser!.newContext({ viewport: { width: 1366, height: 768 }, acceptDownloads: true })
    contexts.push(context)
    context.on('request', (r) => requests.push(r.url()))
    const page = await context.newPage()
    // CI runs these beside CPU-heavy test files on two cores: a render can wait its turn for many seconds
    page.setDefaultTimeout(60_000)
    const errors: string[] = []
    page.on('pageerror', (e) => errors.push(e.message))
    // what the browser logs as an error from the first request on (a missing file, a refused policy…)
    const consoleErrors: string[] = []
    page.on('console', (m) => {
      if (m.type() === 'error') consoleErrors.push(`${m.text()} ${m.location().url ?? ''}`.trim())
    })
    await page.goto(served!.url)
    if (!o.keepCautions) await page.getByTestId('cautions-ok').click()
    if (o.wait !== false && !o.keepCautions) await page.locator('#result-panel[data-fresh="true"]').waitFor({ timeout: 60_000 })
    return { page, errors, consoleErrors }
  }
  return { open, requests, url: () => served!.url }
}

/** A number as the page shows it (negative numbers and exponents with the minus sign U+2212), for comparisons. */
export function shownNumber(text: string | null | undefined): number {
  return Number((text ?? '').trim().replace(/\u2212/g, '-'))
}
