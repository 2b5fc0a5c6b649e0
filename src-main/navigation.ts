// Where a window may go: only the app's own page. Every other navigation, new window and permission is refused.
import type { WindowOpenHandlerResponse } from 'electron'
import { resolve } from 'node:path'
import { pathToFileURL } from 'node:url'

/** The app's page: the built renderer file, or (while developing) the electron-vite dev server on this machine. */
export type AppPage = { kind: 'file'; url: URL } | { kind: 'dev-server'; url: URL }

const LOOPBACK_HOSTS = new Set(['localhost', '127.0.0.1', '[::1]'])

/** The page windows load: the dev server when `devServerUrl` is set (it must be on this machine), else the file. */
export function appPage(devServerUrl: string | undefined, rendererIndexFile: string): AppPage {
  if (!devServerUrl) return { kind: 'file', url: pathToFileURL(resolve(rendererIndexFile)) }
  let url: URL
  try {
    url = new URL(devServerUrl)
  } catch {
    throw new Error(`ELECTRON_RENDERER_URL is not a URL ("${devServerUrl}"): unset it, or set it to the dev server's address, e.g. http://localhost:5173/`)
  }
  if ((url.protocol !== 'http:' && url.protocol !== 'https:') || !LOOPBACK_HOSTS.has(url.hostname) || url.username || url.password) {
    throw new Error(
      `ELECTRON_RENDERER_URL must be a dev server on this machine (http://localhost:PORT/), not "${devServerUrl}": ` +
        'the app never loads pages from elsewhere. Unset it to use the built renderer.'
    )
  }
  return { kind: 'dev-server', url }
}

function parse(url: string): URL | null {
  try {
    return new URL(url)
  } catch {
    return null
  }
}

/** True only for the app's own page (any #fragment or ?query): never a remote site, another file, javascript: or data:. */
export function isAppPage(url: string, page: AppPage): boolean {
  const u = parse(url)
  if (!u || u.username || u.password) return false
  if (page.kind === 'file') return u.protocol === 'file:' && u.host === page.url.host && u.pathname === page.url.pathname
  return u.origin === page.url.origin
}

/** Every request to open a new window (window.open, target=_blank, middle click) is refused. */
export function windowOpenResponse(): WindowOpenHandlerResponse {
  return { action: 'deny' }
}

/** The app needs no browser permission (camera, location, notifications, clipboard reading…): all are refused. */
export function permissionAllowed(_permission: string): boolean {
  return false
}
