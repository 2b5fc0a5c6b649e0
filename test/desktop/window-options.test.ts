// Window options: the page is sandboxed, isolated and without Node; the title shows unsaved changes.
import { describe, expect, it } from 'vitest'
import { APP_NAME, webPreferences, windowIconPath, windowOptions, windowTitle } from '../../src-main/window-options.ts'

describe('web preferences', () => {
  const prefs = webPreferences('/app/out/preload/index.cjs')

  it('isolate the page from the preload, sandbox it and keep Node out of it, its workers and frames', () => {
    expect(prefs).toMatchObject({
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      webSecurity: true
    })
  })

  it('allow no insecure content, webviews, experimental features or navigation by dropping a file', () => {
    expect(prefs.allowRunningInsecureContent).toBe(false)
    expect(prefs.webviewTag).toBe(false)
    expect(prefs.experimentalFeatures).toBe(false)
    expect(prefs.navigateOnDragDrop).toBe(false)
  })

  it('load the preload given', () => {
    expect(prefs.preload).toBe('/app/out/preload/index.cjs')
  })
})

describe('window options', () => {
  it('use those preferences, and show the window only when it is ready', () => {
    const options = windowOptions('/p.cjs')
    expect(options.webPreferences).toEqual(webPreferences('/p.cjs'))
    expect(options.show).toBe(false)
    expect(options.minWidth).toBeLessThanOrEqual(options.width as number)
    expect(options.minHeight).toBeLessThanOrEqual(options.height as number)
  })

  it('fit a 1366 × 768 laptop screen (the screen the workbench is laid out for)', () => {
    const options = windowOptions('/p.cjs')
    expect(options.width).toBeLessThanOrEqual(1366)
    expect(options.height).toBeLessThanOrEqual(768)
  })
})

describe('windowTitle', () => {
  it('marks unsaved changes and names the app', () => {
    const clean = windowTitle('Harrowmere.mote', false)
    const dirty = windowTitle('Harrowmere.mote', true)
    expect(clean).toContain('Harrowmere.mote')
    expect(clean).toContain(APP_NAME)
    expect(dirty).toContain('•')
    expect(clean).not.toContain('•')
  })

  it('names an untitled study rather than showing nothing', () => {
    expect(windowTitle('  ', false)).toMatch(/^Untitled study/)
  })
})

describe('the window icon', () => {
  it('is resources/icon.png beside the built main process (out/main), a PNG of at least 256 × 256 px (PNG signature and IHDR, ISO/IEC 15948)', async () => {
    const { readFileSync } = await import('node:fs')
    const { join } = await import('node:path')
    const repo = join(import.meta.dirname, '../..')
    const path = windowIconPath(join(repo, 'out/main'))
    expect(path).toBe(join(repo, 'resources/icon.png'))
    const png = readFileSync(path)
    expect([...png.subarray(0, 8)]).toEqual([137, 80, 78, 71, 13, 10, 26, 10])
    expect(png.subarray(12, 16).toString('latin1')).toBe('IHDR')
    expect(png.readUInt32BE(16)).toBeGreaterThanOrEqual(256)
    expect(png.readUInt32BE(20)).toBeGreaterThanOrEqual(256)
    expect(windowOptions('/p.cjs', path).icon).toBe(path)
  })
})
