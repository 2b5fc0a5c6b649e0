// Electron main process: thin. Windows, menu, dialogs, files, recovery copies and printing; no physics here.
// Every message from a renderer is checked against src-main/ipc-schemas.ts before it is acted on.
import { app, BrowserWindow, dialog, ipcMain, Menu, shell, type IpcMainInvokeEvent, type MenuItemConstructorOptions } from 'electron'
import { mkdir, readdir, readFile, rename, rm, stat, writeFile } from 'node:fs/promises'
import { basename, join } from 'node:path'
import type { z } from 'zod'
import { CHANNELS, FILE_FILTERS, type MenuCommand, type OpenedFile, type RecoveryCopy, type StartUp } from './host-api.ts'
import { FileChangedError, saveTextAtomically } from './files.ts'
import { exportFileRequest, keepRecoveryRequest, noArguments, printReportRequest, saveStudyRequest, setStateRequest } from './ipc-schemas.ts'

interface WindowState {
  startUp: StartUp
  title: string
  dirty: boolean
  pristine: boolean
  /** The window may close without asking (after "save and close", or "don't save"). */
  closing: boolean
  recoveryFile: string
}

const windows = new Map<number, WindowState>()
const STUDY_FILTERS = [FILE_FILTERS.study, { name: 'JSON', extensions: ['json'] }, { name: 'All files', extensions: ['*'] }]
const SIZER_FILTERS = [{ name: 'Sizer export', extensions: ['csv', 'tsv', 'txt', 'dat'] }, { name: 'All files', extensions: ['*'] }]
const MAX_RECENT = 8

// ---------------------------------------------------------------------------------------------------------------
// Files: every write goes to a temporary file in the same folder, then is renamed over the target. Studies are
// saved by files.ts (which also keeps a .bak and refuses to overwrite a file that changed on disk unasked);
// exports (PNG, PDF, CSV) by writeAtomically below.

/** Modification time and size of study files when this process last read or wrote them. */
const stamps = new Map<string, { mtimeMs: number; size: number }>()

async function writeAtomically(path: string, data: string | Uint8Array): Promise<void> {
  const tmp = `${path}.${process.pid}.${Date.now()}.tmp`
  try {
    await writeFile(tmp, data)
    await rename(tmp, path)
  } catch (e) {
    await rm(tmp, { force: true })
    throw e
  }
}

async function readText(path: string): Promise<OpenedFile> {
  const before = await stat(path)
  const text = await readFile(path, 'utf8')
  stamps.set(path, { mtimeMs: before.mtimeMs, size: before.size })
  return { name: basename(path), path, text }
}

/** Saves study text; if the file changed on disk since it was read, asks before overwriting it. */
async function saveStudyText(win: BrowserWindow, path: string, text: string): Promise<boolean> {
  const stamp = stamps.get(path)
  try {
    const saved = await saveTextAtomically(path, text, stamp ? { expectedMtimeMs: stamp.mtimeMs, expectedSize: stamp.size } : {})
    stamps.set(path, { mtimeMs: saved.mtimeMs, size: saved.size })
    return true
  } catch (e) {
    if (!(e instanceof FileChangedError)) throw e
    const choice = dialog.showMessageBoxSync(win, {
      type: 'warning',
      buttons: ['Overwrite', 'Cancel'],
      defaultId: 1,
      cancelId: 1,
      message: 'The file changed on disk since it was opened here.',
      detail: `${path}\n\nOverwrite it with this window's study? (The previous version is kept as ${basename(path)}.bak.)`
    })
    if (choice !== 0) return false
    const saved = await saveTextAtomically(path, text, { force: true })
    stamps.set(path, { mtimeMs: saved.mtimeMs, size: saved.size })
    return true
  }
}

const userFile = (name: string) => join(app.getPath('userData'), name)
const recoveryDir = () => userFile('recovery')

// ---------------------------------------------------------------------------------------------------------------
// Recent studies (a small JSON list in the user-data folder).

async function recentStudies(): Promise<string[]> {
  try {
    const list = JSON.parse(await readFile(userFile('recent.json'), 'utf8')) as unknown
    return Array.isArray(list) ? list.filter((p): p is string => typeof p === 'string').slice(0, MAX_RECENT) : []
  } catch {
    return []
  }
}

async function rememberStudy(path: string): Promise<void> {
  const list = [path, ...(await recentStudies()).filter((p) => p !== path)].slice(0, MAX_RECENT)
  await mkdir(app.getPath('userData'), { recursive: true })
  await writeAtomically(userFile('recent.json'), JSON.stringify(list, null, 2))
  app.addRecentDocument(path)
  await buildMenu()
}

// ---------------------------------------------------------------------------------------------------------------
// Windows: one per study.

let recoveryCounter = 0

function openWindow(startUp: StartUp): BrowserWindow {
  const win = new BrowserWindow({
    width: 1366,
    height: 768,
    minWidth: 1024,
    minHeight: 640,
    title: 'Motebench',
    show: false,
    webPreferences: {
      preload: join(import.meta.dirname, '../preload/index.cjs'),
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      webSecurity: true,
      spellcheck: false
    }
  })
  const id = win.webContents.id
  windows.set(id, {
    startUp,
    title: 'Motebench',
    dirty: false,
    pristine: !startUp.file,
    closing: false,
    recoveryFile: join(recoveryDir(), `window-${process.pid}-${++recoveryCounter}.json`)
  })
  win.once('ready-to-show', () => win.show())

  // No navigation away from the app, no new windows, no permissions.
  win.webContents.on('will-navigate', (e) => e.preventDefault())
  win.webContents.on('will-redirect', (e) => e.preventDefault())
  win.webContents.setWindowOpenHandler(() => ({ action: 'deny' }))
  win.webContents.session.setPermissionRequestHandler((_wc, _perm, done) => done(false))

  win.on('close', (e) => {
    const state = windows.get(id)
    if (!state || state.closing || !state.dirty) return
    e.preventDefault()
    const choice = dialog.showMessageBoxSync(win, {
      type: 'question',
      buttons: ['Save…', 'Close without saving', 'Cancel'],
      defaultId: 0,
      cancelId: 2,
      message: `Save the changes to “${state.title}” before closing?`,
      detail: 'Unsaved changes are lost when the window closes without saving.'
    })
    if (choice === 0) win.webContents.send(CHANNELS.command, 'save-and-close' satisfies MenuCommand)
    else if (choice === 1) {
      state.closing = true
      win.close()
    }
  })
  win.on('closed', () => {
    const state = windows.get(id)
    windows.delete(id)
    if (state) void rm(state.recoveryFile, { force: true })
  })

  const devUrl = process.env['ELECTRON_RENDERER_URL']
  if (devUrl) void win.loadURL(devUrl)
  else void win.loadFile(join(import.meta.dirname, '../renderer/index.html'))
  return win
}

function stateOf(e: IpcMainInvokeEvent | Electron.IpcMainEvent): WindowState {
  const state = windows.get(e.sender.id)
  if (!state) throw new Error('message from an unknown window')
  return state
}

/** Opens a study file: into `win` when it holds nothing yet, else in a window of its own. */
async function openStudyFile(path: string, win: BrowserWindow | null): Promise<OpenedFile | null> {
  let file: OpenedFile
  try {
    file = await readText(path)
  } catch (e) {
    dialog.showErrorBox('Could not open the study', `${path}\n\n${(e as Error).message}`)
    return null
  }
  await rememberStudy(path)
  const state = win ? windows.get(win.webContents.id) : undefined
  if (win && state?.pristine) return file
  openWindow({ file })
  return null
}

async function askAndOpenStudy(win: BrowserWindow | null): Promise<OpenedFile | null> {
  const options = { title: 'Open a study', properties: ['openFile' as const], filters: STUDY_FILTERS }
  const r = win ? await dialog.showOpenDialog(win, options) : await dialog.showOpenDialog(options)
  if (r.canceled || r.filePaths.length === 0) return null
  return openStudyFile(r.filePaths[0], win)
}

// ---------------------------------------------------------------------------------------------------------------
// IPC: every handler validates its argument first.

function handle<S extends z.ZodType>(channel: string, schema: S, fn: (e: IpcMainInvokeEvent, arg: z.infer<S>) => Promise<unknown>): void {
  ipcMain.handle(channel, async (e, raw: unknown) => {
    const parsed = schema.safeParse(raw)
    if (!parsed.success) throw new Error(`rejected message on ${channel}`)
    stateOf(e)
    return fn(e, parsed.data)
  })
}

const windowOf = (e: IpcMainInvokeEvent | Electron.IpcMainEvent): BrowserWindow => {
  const win = BrowserWindow.fromWebContents(e.sender)
  if (!win) throw new Error('no window')
  return win
}

function registerIpc(): void {
  handle(CHANNELS.startUp, noArguments, async (e) => stateOf(e).startUp)

  handle(CHANNELS.openStudy, noArguments, async (e) => askAndOpenStudy(windowOf(e)))

  handle(CHANNELS.saveStudy, saveStudyRequest, async (e, req) => {
    let path = req.path
    if (!path || req.saveAs) {
      const r = await dialog.showSaveDialog(windowOf(e), { title: 'Save the study', defaultPath: path ?? req.suggestedName, filters: [FILE_FILTERS.study] })
      if (r.canceled || !r.filePath) return null
      path = r.filePath
    }
    if (!(await saveStudyText(windowOf(e), path, req.text))) return null
    await rememberStudy(path)
    const state = stateOf(e)
    state.pristine = false
    return { name: basename(path), path }
  })

  handle(CHANNELS.openSizer, noArguments, async (e) => {
    const r = await dialog.showOpenDialog(windowOf(e), { title: 'Import a sizer file', properties: ['openFile'], filters: SIZER_FILTERS })
    if (r.canceled || r.filePaths.length === 0) return null
    return readText(r.filePaths[0])
  })

  handle(CHANNELS.exportFile, exportFileRequest, async (e, req) => {
    const r = await dialog.showSaveDialog(windowOf(e), { title: 'Export', defaultPath: req.suggestedName, filters: [FILE_FILTERS[req.kind]] })
    if (r.canceled || !r.filePath) return false
    await writeAtomically(r.filePath, req.base64 !== undefined ? Buffer.from(req.base64, 'base64') : (req.text ?? ''))
    return true
  })

  handle(CHANNELS.printReport, printReportRequest, async (e, req) => {
    const win = windowOf(e)
    const r = await dialog.showSaveDialog(win, { title: 'Save the report as PDF', defaultPath: req.suggestedName, filters: [FILE_FILTERS.pdf] })
    if (r.canceled || !r.filePath) return false
    const pdf = await win.webContents.printToPDF({ printBackground: true, pageSize: 'A4', margins: { marginType: 'default' } })
    await writeAtomically(r.filePath, pdf)
    void shell.openPath(r.filePath)
    return true
  })

  handle(CHANNELS.keepRecovery, keepRecoveryRequest, async (e, copy) => {
    const state = stateOf(e)
    if (copy === null) await rm(state.recoveryFile, { force: true })
    else {
      await mkdir(recoveryDir(), { recursive: true })
      await writeAtomically(state.recoveryFile, JSON.stringify(copy))
    }
  })

  ipcMain.on(CHANNELS.setState, (e, raw: unknown) => {
    const parsed = setStateRequest.safeParse(raw)
    const state = windows.get(e.sender.id)
    if (!parsed.success || !state) return
    Object.assign(state, parsed.data)
    const win = BrowserWindow.fromWebContents(e.sender)
    win?.setTitle(`${parsed.data.title}${parsed.data.dirty ? ' •' : ''} — Motebench`)
    win?.setDocumentEdited(parsed.data.dirty)
  })

  ipcMain.on(CHANNELS.closeWindow, (e, raw: unknown) => {
    const state = windows.get(e.sender.id)
    if (raw !== undefined || !state) return
    state.closing = true
    BrowserWindow.fromWebContents(e.sender)?.close()
  })
}

// ---------------------------------------------------------------------------------------------------------------
// Recovery copies left by a crash: offered in the first window, one each.

async function leftoverRecoveryCopies(): Promise<RecoveryCopy[]> {
  let names: string[]
  try {
    names = await readdir(recoveryDir())
  } catch {
    return []
  }
  const copies: RecoveryCopy[] = []
  for (const name of names.filter((n) => n.endsWith('.json'))) {
    const path = join(recoveryDir(), name)
    try {
      const parsed = keepRecoveryRequest.safeParse(JSON.parse(await readFile(path, 'utf8')))
      if (parsed.success && parsed.data) copies.push(parsed.data)
    } catch {
      /* unreadable copy: dropped below */
    }
    await rm(path, { force: true })
  }
  return copies
}

// ---------------------------------------------------------------------------------------------------------------
// The application menu.

function send(command: MenuCommand): void {
  const win = BrowserWindow.getFocusedWindow()
  if (win) win.webContents.send(CHANNELS.command, command)
}

async function buildMenu(): Promise<void> {
  const recent = await recentStudies()
  const isMac = process.platform === 'darwin'
  const template: MenuItemConstructorOptions[] = [
    ...(isMac ? [{ role: 'appMenu' as const }] : []),
    {
      label: '&File',
      submenu: [
        { label: 'New study', accelerator: 'CmdOrCtrl+N', click: () => openWindow({ blank: true }) },
        { label: 'Open study…', accelerator: 'CmdOrCtrl+O', click: () => void askAndOpenStudy(BrowserWindow.getFocusedWindow()).then((f) => f && BrowserWindow.getFocusedWindow()?.webContents.send(CHANNELS.load, f)) },
        {
          label: 'Open recent',
          submenu: recent.length
            ? recent.map((path) => ({
                label: path,
                click: () => {
                  const win = BrowserWindow.getFocusedWindow()
                  void openStudyFile(path, win).then((f) => f && win?.webContents.send(CHANNELS.load, f))
                }
              }))
            : [{ label: 'No recent studies', enabled: false }]
        },
        { type: 'separator' },
        { label: 'Save', accelerator: 'CmdOrCtrl+S', click: () => send('save') },
        { label: 'Save as…', accelerator: 'CmdOrCtrl+Shift+S', click: () => send('save-as') },
        { type: 'separator' },
        { label: 'Import sizer file…', accelerator: 'CmdOrCtrl+I', click: () => send('import-sizer') },
        { label: 'Export results as CSV…', accelerator: 'CmdOrCtrl+E', click: () => send('export-csv') },
        { label: 'Export results as JSON…', accelerator: 'CmdOrCtrl+Shift+E', click: () => send('export-json') },
        { label: 'Export report as PDF…', accelerator: 'CmdOrCtrl+P', click: () => send('export-report') },
        { type: 'separator' },
        isMac ? { role: 'close' } : { role: 'quit', accelerator: 'CmdOrCtrl+Q' }
      ]
    },
    {
      label: '&Edit',
      submenu: [
        { label: 'Undo', accelerator: 'CmdOrCtrl+Z', click: () => send('undo') },
        { label: 'Redo', accelerator: 'CmdOrCtrl+Shift+Z', click: () => send('redo') },
        { type: 'separator' },
        { role: 'cut' },
        { role: 'copy' },
        { role: 'paste' },
        { role: 'selectAll' }
      ]
    },
    { label: '&View', submenu: [{ role: 'resetZoom' }, { role: 'zoomIn' }, { role: 'zoomOut' }, { type: 'separator' }, { role: 'togglefullscreen' }] },
    { label: '&Help', submenu: [{ label: 'Safety and limits of the estimate', accelerator: 'F1', click: () => send('cautions') }] }
  ]
  Menu.setApplicationMenu(Menu.buildFromTemplate(template))
}

// ---------------------------------------------------------------------------------------------------------------

app.enableSandbox()
app.on('web-contents-created', (_e, contents) => {
  contents.on('will-attach-webview', (e) => e.preventDefault())
  contents.setWindowOpenHandler(() => ({ action: 'deny' }))
})

void app.whenReady().then(async () => {
  registerIpc()
  await buildMenu()
  const copies = await leftoverRecoveryCopies()
  const fileArg = process.argv.slice(app.isPackaged ? 1 : 2).find((a) => a.endsWith('.mote'))
  if (copies.length) for (const recovery of copies) openWindow({ recovery })
  else if (fileArg) {
    try {
      openWindow({ file: await readText(fileArg) })
    } catch {
      openWindow({})
    }
  } else openWindow({})
  app.on('activate', () => {
    if (BrowserWindow.getAllWindows().length === 0) openWindow({})
  })
})

app.on('window-all-closed', () => {
  if (process.platform !== 'darwin') app.quit()
})
