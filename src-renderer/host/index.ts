// Chooses the host at start-up: the desktop preload's API when present, else the browser's.
import type { Host } from '../../src-main/host-api.ts'
import { browserHost } from './browser.ts'

declare global {
  interface Window {
    motebenchHost?: Host
  }
}

let chosen: Host | null = null

export function host(): Host {
  if (!chosen) chosen = window.motebenchHost ?? browserHost()
  return chosen
}
