// Navigation and new-window policy: the app's own page only.
import { describe, expect, it } from 'vitest'
import { pathToFileURL } from 'node:url'
import { appPage, isAppPage, permissionAllowed, windowOpenResponse } from '../../src-main/navigation.ts'

const INDEX = '/opt/motebench/resources/app/out/renderer/index.html'
const filePage = appPage(undefined, INDEX)
const devPage = appPage('http://localhost:5173/', INDEX)
const own = pathToFileURL(INDEX).href

describe('the built app (file page)', () => {
  it('allows its own page, with or without a fragment or query', () => {
    expect(isAppPage(own, filePage)).toBe(true)
    expect(isAppPage(`${own}#result-panel`, filePage)).toBe(true)
    expect(isAppPage(`${own}?view=optics`, filePage)).toBe(true)
  })

  it.each([
    ['a remote https site', 'https://example.com/'],
    ['a remote http site', 'http://example.com/index.html'],
    ['a dev server the app did not start from', 'http://localhost:5173/'],
    ['another file in the renderer folder', pathToFileURL('/opt/motebench/resources/app/out/renderer/other.html').href],
    ['a file outside the app', 'file:///etc/passwd'],
    ['a user file', 'file:///home/user/study.mote'],
    ['a sibling folder reached through ..', 'file:///opt/motebench/resources/app/out/renderer/../renderer2/index.html'],
    ['a file on another host', `file://server${pathToFileURL(INDEX).pathname}`],
    ['javascript:', 'javascript:alert(1)'],
    ['data:', 'data:text/html,<script>alert(1)</script>'],
    ['blob:', 'blob:file:///1234'],
    ['about:blank', 'about:blank'],
    ['a browser page', 'chrome://settings'],
    ['devtools', 'devtools://devtools/bundled/inspector.html'],
    ['not a URL', 'index.html'],
    ['an empty string', '']
  ])('refuses %s', (_what, url) => {
    expect(isAppPage(url, filePage)).toBe(false)
  })
})

describe('while developing (dev server page)', () => {
  it('allows pages of the dev server it was started with', () => {
    expect(isAppPage('http://localhost:5173/', devPage)).toBe(true)
    expect(isAppPage('http://localhost:5173/index.html#x', devPage)).toBe(true)
  })

  it.each([
    ['another port', 'http://localhost:5174/'],
    ['another scheme', 'https://localhost:5173/'],
    ['a remote site', 'https://example.com/'],
    ['credentials in the URL', 'http://user:pw@localhost:5173/'],
    ['the built file', own]
  ])('refuses %s', (_what, url) => {
    expect(isAppPage(url, devPage)).toBe(false)
  })

  it('refuses to start from a dev server that is not on this machine, saying what to do', () => {
    expect(() => appPage('https://example.com/', INDEX)).toThrow(/ELECTRON_RENDERER_URL.*this machine.*Unset it/)
    expect(() => appPage('file:///tmp/x.html', INDEX)).toThrow(/ELECTRON_RENDERER_URL/)
    expect(() => appPage('not a url', INDEX)).toThrow(/not a URL/)
  })

  it('accepts the loopback addresses', () => {
    expect(appPage('http://127.0.0.1:5173/', INDEX).kind).toBe('dev-server')
    expect(appPage('http://[::1]:5173/', INDEX).kind).toBe('dev-server')
  })
})

describe('new windows and permissions', () => {
  it('refuses every new window', () => {
    expect(windowOpenResponse()).toEqual({ action: 'deny' })
  })

  it.each(['media', 'geolocation', 'notifications', 'clipboard-read', 'openExternal', 'fullscreen', 'unknown-permission'])('refuses the %s permission', (p) => {
    expect(permissionAllowed(p)).toBe(false)
  })
})
