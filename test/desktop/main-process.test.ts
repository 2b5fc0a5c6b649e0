// The Electron glue (src-main/main.ts) run against a stand-in Electron: start-up, IPC checks, saving, closing,
// recovery, navigation guards and the menu, with real files in a temporary user-data folder.
import type { MenuItemConstructorOptions } from 'electron'
import { mkdir, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { pathToFileURL } from 'node:url'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { CHANNELS } from '../../src-main/host-api.ts'
import { cancellable, fakeElectron, type FakeElectron, type FakeWindow } from './fake-electron.ts'

const hoisted = vi.hoisted(() => ({ electron: null as null | { module: Record<string, unknown> } }))
// Vitest builds a mocked module once; its exports look up the current test's stand-in each time they are used.
vi.mock('electron', () =>
  Object.fromEntries(['app', 'BrowserWindow', 'dialog', 'ipcMain', 'Menu', 'session', 'shell'].map((name) => [name, new Proxy(function () {}, {
    get: (_t, key) => Reflect.get(hoisted.electron!.module[name] as object, key),
    construct: (_t, args) => Reflect.construct(hoisted.electron!.module[name] as new (...a: unknown[]) => object, args)
  })]))
)

let dir: string
let userData: string
let fake: FakeElectron

/** Starts main.ts afresh and waits until its first window is open. */
async function start(prepare?: () => Promise<void>): Promise<FakeWindow> {
  await prepare?.()
  vi.resetModules()
  await import('../../src-main/main.ts')
  await vi.waitFor(() => expect(fake.windows.length).toBeGreaterThan(0), { timeout: 10_000 })
  return fake.windows[0]
}

const APP_PAGE = pathToFileURL(join(import.meta.dirname, '../../renderer/index.html')).href
const study = (name: string) => JSON.stringify({ name })
const copy = { text: study('Valley winter'), savedAt: '2025-03-01T12:00:00.000Z', name: 'Valley winter' }

function menuItems(items: MenuItemConstructorOptions[] = fake.menus[fake.menus.length - 1]): MenuItemConstructorOptions[] {
  return items.flatMap((i) => [i, ...(Array.isArray(i.submenu) ? menuItems(i.submenu) : [])])
}
const click = (label: string) => (menuItems().find((i) => i.label === label)!.click as () => void)()

beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-main-'))
  userData = join(dir, 'user-data')
  fake = fakeElectron(userData)
  hoisted.electron = fake
  vi.spyOn(console, 'warn').mockImplementation(() => {})
})
afterEach(async () => {
  vi.restoreAllMocks()
  await rm(dir, { recursive: true, force: true })
})

describe('start-up', () => {
  it('opens one sandboxed window on the app page, with the demo, and a menu', async () => {
    const win = await start()
    expect(fake.windows).toHaveLength(1)
    expect(win.loadedUrl).toBe(APP_PAGE)
    expect(win.options.webPreferences).toMatchObject({ sandbox: true, contextIsolation: true, nodeIntegration: false, webSecurity: true })
    expect(await fake.invoke(win, CHANNELS.startUp)).toEqual({})
    expect(menuItems().some((i) => i.label === 'No recent studies')).toBe(true)
  })

  it('handles every renderer-to-main channel of the host API', async () => {
    await start()
    const toMain = Object.entries(CHANNELS)
      .filter(([name]) => name !== 'command' && name !== 'load')
      .map(([, channel]) => channel)
    expect(fake.channels().sort()).toEqual(toMain.sort())
  })

  it('offers a copy left by a crashed process, and removes it when the user declines', async () => {
    const recovery = join(userData, 'recovery')
    // pid 999999999 exceeds any pid the kernel hands out, so its process cannot be running.
    const win = await start(async () => {
      await mkdir(recovery, { recursive: true })
      await writeFile(join(recovery, 'window-999999999-1.json'), JSON.stringify(copy))
    })
    expect(await fake.invoke(win, CHANNELS.startUp)).toEqual({ recovery: copy })
    expect(await readdir(recovery)).toHaveLength(1)
    await fake.invoke(win, CHANNELS.keepRecovery, null)
    expect(await readdir(recovery)).toEqual([])
  })
})

describe('IPC checks', () => {
  it('refuses a message from a page that is not the app', async () => {
    const win = await start()
    await expect(fake.invoke(win, CHANNELS.startUp, undefined, 'https://example.com/')).rejects.toThrow(/not the app's page/)
  })

  it('refuses a malformed message, naming the field', async () => {
    const win = await start()
    await expect(fake.invoke(win, CHANNELS.saveStudy, { text: '{}', suggestedName: 'a.mote', saveAs: 'yes' })).rejects.toThrow(/saveAs/)
    expect(fake.dialogs.saveDialogs).toHaveLength(0)
  })

  it('ignores a malformed one-way message and says why in the log', async () => {
    const win = await start()
    fake.send(win, CHANNELS.setState, { title: 'x', dirty: 'yes', pristine: false })
    expect(win.title).toBe('')
    expect(console.warn).toHaveBeenCalledWith(expect.stringMatching(/dirty/))
  })
})

describe('saving', () => {
  it('asks where to save a new study, then saves there again without asking, and lists it as recent', async () => {
    const win = await start()
    const path = join(dir, 'valley.mote')
    fake.dialogs.saveDialogAnswers.push(path)
    expect(await fake.invoke(win, CHANNELS.saveStudy, { text: study('v1'), suggestedName: 'valley.mote', saveAs: false })).toEqual({ name: 'valley.mote', path })
    expect(await fake.invoke(win, CHANNELS.saveStudy, { text: study('v2'), path, suggestedName: 'valley.mote', saveAs: false })).toEqual({ name: 'valley.mote', path })
    expect(fake.dialogs.saveDialogs).toHaveLength(1)
    expect(await readFile(path, 'utf8')).toBe(study('v2'))
    expect(JSON.parse(await readFile(join(userData, 'recent.json'), 'utf8'))).toEqual([path])
    expect(menuItems().some((i) => i.label === path)).toBe(true)
    expect(fake.app.recentDocuments).toContain(path)
  })

  it('never writes to a path the window was not given: it asks instead', async () => {
    const win = await start()
    const target = join(dir, 'not-given.txt')
    await writeFile(target, 'keep me')
    expect(await fake.invoke(win, CHANNELS.saveStudy, { text: 'overwrite', path: target, suggestedName: 'x.mote', saveAs: false })).toBeNull()
    expect(fake.dialogs.saveDialogs).toHaveLength(1)
    expect(await readFile(target, 'utf8')).toBe('keep me')
  })

  it('asks before overwriting a study changed on disk since it was opened', async () => {
    const path = join(dir, 'valley.mote')
    await writeFile(path, study('v1'))
    const win = await start()
    fake.dialogs.openDialogAnswers.push(path)
    expect(await fake.invoke(win, CHANNELS.openStudy)).toMatchObject({ path, text: study('v1') })
    await writeFile(path, study('changed elsewhere, and longer'))
    fake.dialogs.messageBoxAnswers.push(1) // Cancel
    expect(await fake.invoke(win, CHANNELS.saveStudy, { text: study('mine'), path, suggestedName: 'valley.mote', saveAs: false })).toBeNull()
    expect(fake.dialogs.messageBoxes[0].message).toMatch(/changed on disk/)
    expect(await readFile(path, 'utf8')).toBe(study('changed elsewhere, and longer'))
  })

  it('opens a second study in a window of its own', async () => {
    const [a, b] = [join(dir, 'a.mote'), join(dir, 'b.mote')]
    await writeFile(a, study('a'))
    await writeFile(b, study('b'))
    const win = await start()
    fake.dialogs.openDialogAnswers.push(a, b)
    expect(await fake.invoke(win, CHANNELS.openStudy)).toMatchObject({ path: a })
    expect(await fake.invoke(win, CHANNELS.openStudy)).toBeNull()
    expect(fake.windows).toHaveLength(2)
    expect(await fake.invoke(fake.windows[1], CHANNELS.startUp)).toMatchObject({ file: { path: b, text: study('b') } })
  })

  it('shows why a study could not be opened', async () => {
    const win = await start()
    fake.dialogs.openDialogAnswers.push(join(dir, 'gone.mote'))
    expect(await fake.invoke(win, CHANNELS.openStudy)).toBeNull()
    expect(fake.dialogs.errorBoxes[0].content).toMatch(/gone\.mote.*not there/)
  })

  it('writes exports and the report where the user says', async () => {
    const win = await start()
    const png = join(dir, 'chart.png')
    const pdf = join(dir, 'report.pdf')
    fake.dialogs.saveDialogAnswers.push(png, pdf)
    const bytes = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0xff])
    expect(await fake.invoke(win, CHANNELS.exportFile, { suggestedName: 'chart.png', kind: 'png', base64: bytes.toString('base64') })).toBe(true)
    expect(Buffer.compare(await readFile(png), bytes)).toBe(0)
    expect(await fake.invoke(win, CHANNELS.printReport, { suggestedName: 'report.pdf' })).toBe(true)
    expect((await readFile(pdf, 'utf8')).startsWith('%PDF')).toBe(true)
    expect(fake.openedPaths).toEqual([pdf])
  })
})

describe('closing', () => {
  async function dirtyWindow() {
    const win = await start()
    fake.send(win, CHANNELS.setState, { title: 'Valley winter', dirty: true, pristine: false })
    await fake.invoke(win, CHANNELS.keepRecovery, copy)
    return win
  }
  const recoveryFiles = () => readdir(join(userData, 'recovery'))

  it('shows unsaved changes in the title', async () => {
    const win = await dirtyWindow()
    expect(win.title).toContain('Valley winter')
    expect(win.title).toContain('•')
    expect(win.documentEdited).toBe(true)
  })

  it('asks before closing with unsaved changes, and Cancel keeps the window and its recovery copy', async () => {
    const win = await dirtyWindow()
    fake.dialogs.messageBoxAnswers.push(2)
    win.close()
    expect(fake.dialogs.messageBoxes[0].message).toContain('Valley winter')
    expect(win.destroyed).toBe(false)
    expect(await recoveryFiles()).toHaveLength(1)
  })

  it('closes without saving when told, and removes the recovery copy', async () => {
    const win = await dirtyWindow()
    fake.dialogs.messageBoxAnswers.push(1)
    win.close()
    expect(win.destroyed).toBe(true)
    await vi.waitFor(async () => expect(await recoveryFiles()).toEqual([]))
  })

  it('asks the page to save first, then closes without asking again', async () => {
    const win = await dirtyWindow()
    fake.dialogs.messageBoxAnswers.push(0)
    win.close()
    expect(win.destroyed).toBe(false)
    expect(win.webContents.sent).toContainEqual([CHANNELS.command, 'save-and-close'])
    fake.send(win, CHANNELS.closeWindow)
    expect(win.destroyed).toBe(true)
    expect(fake.dialogs.messageBoxes).toHaveLength(1)
  })

  it('leaves no recovery copy when a copy is still being written as its window closes', async () => {
    const win = await start()
    const writing = fake.invoke(win, CHANNELS.keepRecovery, copy)
    win.close()
    await writing
    await vi.waitFor(async () => expect(await recoveryFiles()).toEqual([]))
  })

  it('quits when the last window closes (not on macOS)', async () => {
    const win = await start()
    win.close()
    fake.app.emit('window-all-closed')
    expect(fake.app.quitCalls).toBe(process.platform === 'darwin' ? 0 : 1)
  })
})

describe('guards', () => {
  it('stops navigation away from the app page, new windows and webviews', async () => {
    const win = await start()
    const away = cancellable()
    win.webContents.emit('will-navigate', away, 'https://example.com/')
    expect(away.defaultPrevented).toBe(true)
    const framed = cancellable({ url: 'file:///etc/passwd' })
    win.webContents.emit('will-frame-navigate', framed)
    expect(framed.defaultPrevented).toBe(true)
    const home = cancellable()
    win.webContents.emit('will-navigate', home, `${APP_PAGE}#result-panel`)
    expect(home.defaultPrevented).toBe(false)
    expect(win.webContents.windowOpenHandler?.({ url: 'https://example.com/' })).toEqual({ action: 'deny' })
    const webview = cancellable()
    win.webContents.emit('will-attach-webview', webview)
    expect(webview.defaultPrevented).toBe(true)
  })

  it('refuses permissions and puts the content policy on responses', async () => {
    await start()
    const done = vi.fn()
    fake.guards.permission!(null, 'media', done)
    expect(done).toHaveBeenCalledWith(false)
    let response: any
    fake.guards.headers!({ responseHeaders: { 'content-security-policy': ['default-src *'] } }, (r) => (response = r))
    expect(response.responseHeaders['Content-Security-Policy'][0]).toMatch(/^default-src 'self'/)
    expect(response.responseHeaders['content-security-policy']).toBeUndefined()
  })
})

describe('the menu', () => {
  it('sends commands to the focused window, and New opens a blank window', async () => {
    const win = await start()
    click('Save')
    expect(win.webContents.sent).toContainEqual([CHANNELS.command, 'save'])
    click('New study')
    expect(fake.windows).toHaveLength(2)
    expect(await fake.invoke(fake.windows[1], CHANNELS.startUp)).toEqual({ blank: true })
  })

  it('opens a recent study into the window that holds nothing yet', async () => {
    const path = join(dir, 'valley.mote')
    await writeFile(path, study('v1'))
    await mkdir(userData, { recursive: true })
    await writeFile(join(userData, 'recent.json'), JSON.stringify([path]))
    const win = await start()
    click(path)
    await vi.waitFor(() => expect(win.webContents.sent).toContainEqual([CHANNELS.load, { name: 'valley.mote', path, text: study('v1') }]))
    expect(fake.windows).toHaveLength(1)
  })

  it('opens a study the desktop hands over (macOS open-file) like a recent one', async () => {
    const path = join(dir, 'valley.mote')
    await writeFile(path, study('v1'))
    const win = await start()
    const event = cancellable()
    fake.app.emit('open-file', event, path)
    expect(event.defaultPrevented).toBe(true)
    await vi.waitFor(() => expect(win.webContents.sent).toContainEqual([CHANNELS.load, { name: 'valley.mote', path, text: study('v1') }]))
  })
})
