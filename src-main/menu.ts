// The application menu as a template: every item says which menu command it sends; Electron only draws it.
import type { MenuItemConstructorOptions } from 'electron'
import type { MenuCommand } from './host-api.ts'

export interface MenuActions {
  /** A menu command (for the focused window, or `new` / `open`, which the main process handles itself). */
  send(command: MenuCommand): void
  /** File ▸ Open recent ▸ a study. */
  openRecent(path: string): void
}

/** Windows and Linux underline a letter after `&` (Alt+letter opens the menu); macOS has no such keys. */
const usesMnemonics = (platform: NodeJS.Platform) => platform !== 'darwin'

/** A label shown as typed: on Windows and Linux a literal `&` is written `&&`. */
export function literalLabel(text: string, platform: NodeJS.Platform): string {
  return usesMnemonics(platform) ? text.replaceAll('&', '&&') : text
}

/** A top-level label with its Alt+letter key (the letter after `&`) where the platform has them. */
function topLabel(label: string, platform: NodeJS.Platform): string {
  return usesMnemonics(platform) ? label : label.replace('&', '')
}

function recentSubmenu(recent: readonly string[], platform: NodeJS.Platform, actions: MenuActions): MenuItemConstructorOptions[] {
  if (!recent.length) return [{ label: 'No recent studies', enabled: false }]
  return recent.map((path) => ({ label: literalLabel(path, platform), click: () => actions.openRecent(path) }))
}

/** The whole menu bar for `platform`, with `recent` (newest first) under File ▸ Open recent. */
export function menuTemplate(platform: NodeJS.Platform, recent: readonly string[], actions: MenuActions): MenuItemConstructorOptions[] {
  const isMac = platform === 'darwin'
  const command = (label: string, accelerator: string, name: MenuCommand): MenuItemConstructorOptions => ({
    label,
    accelerator,
    click: () => actions.send(name)
  })
  const separator: MenuItemConstructorOptions = { type: 'separator' }
  const file: MenuItemConstructorOptions[] = [
    command('New study', 'CmdOrCtrl+N', 'new'),
    command('Open study…', 'CmdOrCtrl+O', 'open'),
    { label: 'Open recent', submenu: recentSubmenu(recent, platform, actions) },
    separator,
    command('Save', 'CmdOrCtrl+S', 'save'),
    command('Save as…', 'CmdOrCtrl+Shift+S', 'save-as'),
    separator,
    command('Import sizer file…', 'CmdOrCtrl+I', 'import-sizer'),
    command('Add instrument files to the station record…', 'CmdOrCtrl+Shift+A', 'add-instrument-files'),
    command('Export results as CSV…', 'CmdOrCtrl+E', 'export-csv'),
    command('Export results as JSON…', 'CmdOrCtrl+Shift+E', 'export-json'),
    command('Export report as PDF…', 'CmdOrCtrl+P', 'export-report'),
    separator,
    { role: 'close', label: 'Close window', accelerator: 'CmdOrCtrl+W' },
    // macOS quits from the application menu (its role brings Quit, Cmd+Q).
    ...(isMac ? [] : [{ role: 'quit', label: 'Quit', accelerator: 'CmdOrCtrl+Q' } satisfies MenuItemConstructorOptions])
  ]
  const edit: MenuItemConstructorOptions[] = [
    command('Undo', 'CmdOrCtrl+Z', 'undo'),
    command('Redo', 'CmdOrCtrl+Shift+Z', 'redo'),
    separator,
    { role: 'cut', accelerator: 'CmdOrCtrl+X' },
    { role: 'copy', accelerator: 'CmdOrCtrl+C' },
    { role: 'paste', accelerator: 'CmdOrCtrl+V' },
    { role: 'selectAll', accelerator: 'CmdOrCtrl+A' }
  ]
  const view: MenuItemConstructorOptions[] = [
    { role: 'resetZoom', accelerator: 'CmdOrCtrl+0' },
    { role: 'zoomIn', accelerator: 'CmdOrCtrl+Plus' },
    { role: 'zoomOut', accelerator: 'CmdOrCtrl+-' },
    separator,
    command('Component catalogue…', 'CmdOrCtrl+Shift+M', 'catalogue'),
    separator,
    { role: 'togglefullscreen', accelerator: isMac ? 'Ctrl+Cmd+F' : 'F11' }
  ]
  const help: MenuItemConstructorOptions[] = [command('Safety and limits of the estimate', 'F1', 'cautions')]
  return [
    ...(isMac ? [{ role: 'appMenu' } satisfies MenuItemConstructorOptions] : []),
    { label: topLabel('&File', platform), submenu: file },
    { label: topLabel('&Edit', platform), submenu: edit },
    { label: topLabel('&View', platform), submenu: view },
    { label: topLabel('&Help', platform), submenu: help }
  ]
}
