// A stand-in for the parts of Electron that src-main/main.ts uses, so the glue runs under plain Node in vitest.
// It records what main does (windows, menus, dialogs, messages) and lets a test answer dialogs and send messages.
import type { MenuItemConstructorOptions } from 'electron'

type Listener = (...args: any[]) => unknown

class Emitter {
  private readonly listeners = new Map<string, Listener[]>()
  on(event: string, fn: Listener): this {
    this.listeners.set(event, [...(this.listeners.get(event) ?? []), fn])
    return this
  }
  once(event: string, fn: Listener): this {
    const wrapped: Listener = (...args) => {
      this.listeners.set(event, (this.listeners.get(event) ?? []).filter((f) => f !== wrapped))
      return fn(...args)
    }
    return this.on(event, wrapped)
  }
  emit(event: string, ...args: unknown[]): void {
    for (const fn of this.listeners.get(event) ?? []) fn(...args)
  }
  count(event: string): number {
    return this.listeners.get(event)?.length ?? 0
  }
}

/** An event a handler may cancel. */
export function cancellable(extra: object = {}) {
  return Object.assign({ defaultPrevented: false, preventDefault() { this.defaultPrevented = true } }, extra)
}

export function fakeElectron(userData: string) {
  let nextId = 1
  const app = Object.assign(new Emitter(), {
    ready: false,
    quitCalls: 0,
    recentDocuments: [] as string[],
    isPackaged: false,
    getPath: (name: string) => {
      if (name !== 'userData') throw new Error(`fake app.getPath: ${name} not faked`)
      return userData
    },
    enableSandbox: () => {},
    whenReady: async () => {
      app.ready = true
    },
    isReady: () => app.ready,
    addRecentDocument: (path: string) => void app.recentDocuments.push(path),
    quit: () => void app.quitCalls++
  })

  class WebContents extends Emitter {
    readonly id = nextId++
    readonly sent: [string, unknown][] = []
    readonly mainFrame = { url: '', parent: null }
    windowOpenHandler: ((details: { url: string }) => unknown) | null = null
    send(channel: string, message: unknown) {
      this.sent.push([channel, message])
    }
    setWindowOpenHandler(handler: (details: { url: string }) => unknown) {
      this.windowOpenHandler = handler
    }
    async printToPDF() {
      return Buffer.from('%PDF-1.7 fake report')
    }
  }

  const windows: FakeWindow[] = []
  let focused: FakeWindow | null = null

  class FakeWindow extends Emitter {
    static getFocusedWindow = () => focused
    static getAllWindows = () => windows.filter((w) => !w.destroyed)
    static fromWebContents = (contents: unknown) => windows.find((w) => w.webContents === contents && !w.destroyed) ?? null
    readonly options: any
    readonly webContents = new WebContents()
    destroyed = false
    title = ''
    documentEdited = false
    loadedUrl = ''
    constructor(options: unknown) {
      super()
      this.options = options
      windows.push(this)
      focused = this
      app.emit('web-contents-created', cancellable(), this.webContents)
    }
    async loadURL(url: string) {
      this.loadedUrl = url
      this.webContents.mainFrame.url = url
    }
    show() {}
    isDestroyed() {
      return this.destroyed
    }
    setTitle(title: string) {
      this.title = title
    }
    setDocumentEdited(edited: boolean) {
      this.documentEdited = edited
    }
    close() {
      const e = cancellable()
      this.emit('close', e)
      if (e.defaultPrevented) return
      this.destroyed = true
      if (focused === this) focused = null
      this.emit('closed')
    }
  }

  const handlers = new Map<string, Listener>()
  const oneWay = new Map<string, Listener>()
  const ipcMain = {
    handle: (channel: string, fn: Listener) => {
      if (handlers.has(channel)) throw new Error(`fake ipcMain: a second handler for ${channel}`)
      handlers.set(channel, fn)
    },
    on: (channel: string, fn: Listener) => void oneWay.set(channel, fn)
  }

  const dialogs = {
    messageBoxes: [] as any[],
    messageBoxAnswers: [] as number[],
    saveDialogs: [] as any[],
    saveDialogAnswers: [] as string[],
    openDialogs: [] as any[],
    openDialogAnswers: [] as string[],
    errorBoxes: [] as { title: string; content: string }[]
  }
  const dialog = {
    showMessageBoxSync: (_win: unknown, options: any) => {
      dialogs.messageBoxes.push(options)
      return dialogs.messageBoxAnswers.shift() ?? options.cancelId
    },
    showSaveDialog: async (_win: unknown, options: any) => {
      dialogs.saveDialogs.push(options)
      const filePath = dialogs.saveDialogAnswers.shift()
      return filePath ? { canceled: false, filePath } : { canceled: true, filePath: '' }
    },
    showOpenDialog: async (...args: any[]) => {
      dialogs.openDialogs.push(args[args.length - 1])
      const path = dialogs.openDialogAnswers.shift()
      return path ? { canceled: false, filePaths: [path] } : { canceled: true, filePaths: [] }
    },
    showErrorBox: (title: string, content: string) => void dialogs.errorBoxes.push({ title, content })
  }

  const menus: MenuItemConstructorOptions[][] = []
  const Menu = {
    buildFromTemplate: (template: MenuItemConstructorOptions[]) => ({ template }),
    setApplicationMenu: (menu: { template: MenuItemConstructorOptions[] }) => void menus.push(menu.template)
  }

  const guards = {
    permission: null as null | ((contents: unknown, permission: string, done: (allowed: boolean) => void) => void),
    headers: null as null | ((details: { responseHeaders?: Record<string, string[]> }, done: (r: unknown) => void) => void)
  }
  const session = {
    defaultSession: {
      setPermissionRequestHandler: (fn: typeof guards.permission) => void (guards.permission = fn),
      webRequest: { onHeadersReceived: (fn: typeof guards.headers) => void (guards.headers = fn) }
    }
  }

  const openedPaths: string[] = []
  const shell = { openPath: async (path: string) => (openedPaths.push(path), '') }

  /** The event a handler receives for a message from `win` (its page unless `frameUrl` says otherwise). */
  const ipcEvent = (win: FakeWindow, frameUrl?: string) => ({
    sender: win.webContents,
    senderFrame: { url: frameUrl ?? win.webContents.mainFrame.url, parent: null }
  })

  return {
    module: { app, BrowserWindow: FakeWindow, dialog, ipcMain, Menu, session, shell },
    app,
    windows,
    dialogs,
    menus,
    guards,
    openedPaths,
    focus: (win: FakeWindow | null) => void (focused = win),
    /** Calls an invoke handler as the preload would. */
    invoke: async (win: FakeWindow, channel: string, message?: unknown, frameUrl?: string) => {
      const fn = handlers.get(channel)
      if (!fn) throw new Error(`fake ipcMain: no handler for ${channel}`)
      return fn(ipcEvent(win, frameUrl), message)
    },
    /** Sends a one-way message as the preload would. */
    send: (win: FakeWindow, channel: string, message?: unknown, frameUrl?: string) => {
      const fn = oneWay.get(channel)
      if (!fn) throw new Error(`fake ipcMain: no listener for ${channel}`)
      fn(ipcEvent(win, frameUrl), message)
    },
    channels: () => [...handlers.keys(), ...oneWay.keys()]
  }
}

export type FakeElectron = ReturnType<typeof fakeElectron>
export type FakeWindow = FakeElectron['windows'][number]
