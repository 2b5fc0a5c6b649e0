// What a study window is made with: size, and web preferences that keep the page away from Node and the network.
import { join } from 'node:path'
import type { BrowserWindowConstructorOptions, WebPreferences } from 'electron'

export const APP_NAME = 'Motebench'

/** The web preferences of every window: the page runs sandboxed, isolated from the preload, without Node. */
export function webPreferences(preloadPath: string): WebPreferences {
  return {
    preload: preloadPath,
    contextIsolation: true,
    sandbox: true,
    nodeIntegration: false,
    nodeIntegrationInWorker: false,
    nodeIntegrationInSubFrames: false,
    webSecurity: true,
    allowRunningInsecureContent: false,
    webviewTag: false,
    navigateOnDragDrop: false,
    experimentalFeatures: false,
    spellcheck: false
  }
}

/**
 * The window's icon: resources/icon.png (256 px, rendered from src-renderer/icon.svg, the page's icon), found from
 * the folder of the built main process (out/main).
 */
export function windowIconPath(mainDir: string): string {
  return join(mainDir, '../../resources/icon.png')
}

/** A study window: sized for a 1366 × 768 laptop screen, shown once its first paint is ready. */
export function windowOptions(preloadPath: string, iconPath?: string): BrowserWindowConstructorOptions {
  return {
    ...(iconPath ? { icon: iconPath } : {}),
    width: 1366,
    height: 768,
    minWidth: 1024,
    minHeight: 640,
    title: APP_NAME,
    show: false,
    webPreferences: webPreferences(preloadPath)
  }
}

/** The title bar: the study's name, a dot while it has unsaved changes, then the app's name. */
export function windowTitle(studyTitle: string, dirty: boolean): string {
  const name = studyTitle.trim() || 'Untitled study'
  return `${name}${dirty ? ' •' : ''} — ${APP_NAME}`
}
