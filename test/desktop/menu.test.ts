// The application menu: every command reachable once, with its own shortcut, on every platform.
import type { MenuItemConstructorOptions } from 'electron'
import { describe, expect, it } from 'vitest'
import { MENU_COMMANDS, type MenuCommand } from '../../src-main/host-api.ts'
import { literalLabel, menuTemplate } from '../../src-main/menu.ts'

const PLATFORMS: NodeJS.Platform[] = ['linux', 'win32', 'darwin']

function flatten(items: MenuItemConstructorOptions[]): MenuItemConstructorOptions[] {
  return items.flatMap((item) => [item, ...(Array.isArray(item.submenu) ? flatten(item.submenu) : [])])
}

/** Builds the menu and clicks every item, recording what each one asked for. */
function clickEverything(platform: NodeJS.Platform, recent: string[] = []) {
  const sent: MenuCommand[] = []
  const opened: string[] = []
  const items = flatten(menuTemplate(platform, recent, { send: (c) => sent.push(c), openRecent: (p) => opened.push(p) }))
  const byCommand = new Map<MenuCommand, MenuItemConstructorOptions>()
  for (const item of items) {
    if (!item.click) continue
    const before = sent.length
    ;(item.click as () => void)()
    if (sent.length > before) byCommand.set(sent[sent.length - 1], item)
  }
  return { items, sent, opened, byCommand }
}

/** An accelerator in one spelling: modifiers sorted, letter case ignored. */
function normalised(accelerator: string): string {
  const keys = accelerator.toLowerCase().split('+')
  const key = keys.pop() as string
  return [...keys.sort(), key].join('+')
}

describe.each(PLATFORMS)('menu on %s', (platform) => {
  it('sends every user command exactly once (save-and-close belongs to the close question, not the menu)', () => {
    const { sent } = clickEverything(platform)
    const userCommands = MENU_COMMANDS.filter((c) => c !== 'save-and-close')
    expect([...sent].sort()).toEqual([...userCommands].sort())
  })

  it('gives every command item an accelerator, and no two items the same one', () => {
    const { items, byCommand } = clickEverything(platform)
    for (const [command, item] of byCommand) expect(item.accelerator, `accelerator of ${command}`).toBeTruthy()
    const accelerators = items.map((i) => i.accelerator).filter((a): a is string => typeof a === 'string').map(normalised)
    expect(new Set(accelerators).size).toBe(accelerators.length)
  })

  it('uses the usual shortcuts for the file commands', () => {
    const { byCommand } = clickEverything(platform)
    const expected: Partial<Record<MenuCommand, string>> = {
      // (common practice: the shortcuts desktop applications use for these commands)
      new: 'CmdOrCtrl+N',
      open: 'CmdOrCtrl+O',
      save: 'CmdOrCtrl+S',
      'save-as': 'CmdOrCtrl+Shift+S',
      'export-report': 'CmdOrCtrl+P',
      undo: 'CmdOrCtrl+Z',
      'import-sizer': 'CmdOrCtrl+I',
      'export-csv': 'CmdOrCtrl+E',
      'export-json': 'CmdOrCtrl+Shift+E',
      cautions: 'F1'
    }
    for (const [command, accelerator] of Object.entries(expected)) {
      expect(normalised(String(byCommand.get(command as MenuCommand)?.accelerator)), command).toBe(normalised(accelerator))
    }
  })

  it('offers adding instrument files to the station record in the File menu, after the sizer import', () => {
    const { byCommand } = clickEverything(platform)
    const item = byCommand.get('add-instrument-files')
    expect(item?.label).toBe('Add instrument files to the station record…')
    expect(normalised(String(item?.accelerator))).toBe(normalised('CmdOrCtrl+Shift+A'))
    const top = menuTemplate(platform, [], { send: () => {}, openRecent: () => {} })
    const file = top.find((t) => String(t.label).replace('&', '') === 'File')!.submenu as MenuItemConstructorOptions[]
    const labels = file.map((i) => i.label)
    expect(labels.indexOf('Add instrument files to the station record…')).toBe(labels.indexOf('Import sizer file…') + 1)
  })

  it('puts Undo and Redo first in the Edit menu, and the component catalogue in the View menu', () => {
    const top = menuTemplate(platform, [], { send: () => {}, openRecent: () => {} })
    const submenu = (label: string) => top.find((i) => String(i.label ?? '').replace('&', '') === label)?.submenu as MenuItemConstructorOptions[]
    const { byCommand } = clickEverything(platform)
    const edit = submenu('Edit')
    expect(edit.slice(0, 2).map((i) => i.label)).toEqual(['Undo', 'Redo'])
    expect(byCommand.get('undo')?.label).toBe('Undo')
    expect(byCommand.get('redo')?.label).toBe('Redo')
    // (common practice: Shift with the undo key redoes)
    expect(normalised(String(byCommand.get('redo')?.accelerator))).toBe(normalised('CmdOrCtrl+Shift+Z'))
    expect(byCommand.get('catalogue')?.label).toBe('Component catalogue…')
    expect(submenu('View').map((i) => i.label)).toContain('Component catalogue…')
  })

  it('leaves Alt+1…8 free for the result views', () => {
    const { items } = clickEverything(platform)
    for (const item of items) expect(String(item.accelerator ?? '')).not.toMatch(/alt\+[1-8]$/i)
  })

  it('can close the window and quit', () => {
    const { items } = clickEverything(platform)
    expect(items.find((i) => i.role === 'close')?.accelerator).toBe('CmdOrCtrl+W')
    if (platform === 'darwin') {
      // macOS: Quit lives in the application menu, which the appMenu role supplies.
      expect(items.some((i) => i.role === 'appMenu')).toBe(true)
      expect(items.some((i) => i.role === 'quit')).toBe(false)
    } else {
      expect(items.find((i) => i.role === 'quit')?.accelerator).toBe('CmdOrCtrl+Q')
      expect(items.some((i) => i.role === 'appMenu')).toBe(false)
    }
  })

  it('lists recent studies in the given order and opens the one clicked', () => {
    const recent = ['/data/b.mote', '/data/a.mote']
    const { items, opened } = clickEverything(platform, recent)
    const openRecent = items.find((i) => i.label === 'Open recent')
    const entries = (openRecent?.submenu as MenuItemConstructorOptions[]).map((i) => i.label)
    expect(entries).toEqual(recent.map((p) => literalLabel(p, platform)))
    expect(opened).toEqual(recent)
  })

  it('says so when there are no recent studies, with nothing to click', () => {
    const { items } = clickEverything(platform, [])
    const submenu = items.find((i) => i.label === 'Open recent')?.submenu as MenuItemConstructorOptions[]
    expect(submenu).toHaveLength(1)
    expect(submenu[0].enabled).toBe(false)
    expect(submenu[0].click).toBeUndefined()
  })
})

describe('menu labels', () => {
  it('marks Alt+letter keys on Windows and Linux but not on macOS', () => {
    const top = (platform: NodeJS.Platform) => menuTemplate(platform, [], { send: () => {}, openRecent: () => {} }).map((i) => i.label)
    expect(top('linux')).toEqual(['&File', '&Edit', '&View', '&Help'])
    expect(top('win32')).toEqual(['&File', '&Edit', '&View', '&Help'])
    expect(top('darwin')).toEqual([undefined, 'File', 'Edit', 'View', 'Help'])
  })

  it('shows an & in a recent path as itself, not as a shortcut mark', () => {
    expect(literalLabel('/data/salt & dust.mote', 'linux')).toBe('/data/salt && dust.mote')
    expect(literalLabel('C:\\R&D\\a.mote', 'win32')).toBe('C:\\R&&D\\a.mote')
    expect(literalLabel('/data/salt & dust.mote', 'darwin')).toBe('/data/salt & dust.mote')
  })
})
