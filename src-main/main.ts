// Electron main process: glue only. It wires windows, dialogs, the menu and IPC to the Electron-free modules beside
// it, which take every decision (and are tested under plain Node in test/desktop). No physics here.
import { app, BrowserWindow, dialog, ipcMain, Menu, session, shell, type IpcMainEvent, type IpcMainInvokeEvent, type WebContents } from 'electron'
import { basename, join } from 'node:path'
import { closeAnswer, onCloseRequest, unsavedChangesQuestion } from './closing.ts'
import { withContentPolicy } from './content-policy.ts'
import { exportContent, writeExport } from './export-file.ts'
import { CHANNELS, FILE_FILTERS, type MenuCommand, type OpenedFile, type StartUp } from './host-api.ts'
import { checkMessage, type ChannelMessage, type ChannelName } from './ipc-schemas.ts'
import { menuTemplate } from './menu.ts'
import { appPage, isAppPage, permissionAllowed, windowOpenResponse } from './navigation.ts'
import { RecentStudies } from './recent-studies.ts'
import { RecoveryStore } from './recovery-store.ts'
import { firstWindows, quitsWhenAllWindowsClose, studyArgument } from './start-up.ts'
import { overwriteChosen, overwriteQuestion, readChosenFile, readInstrumentFile, StudyFiles } from './study-saving.ts'
import { windowIconPath, windowOptions, windowTitle } from './window-options.ts'
import { WindowRegistry, type WindowRecord } from './window-registry.ts'

const STUDY_FILTERS = [FILE_FILTERS.study, { name: 'JSON', extensions: ['json'] }, { name: 'All files', extensions: ['*'] }]
const instrumentFileName = (path: string): boolean => /\.(csv|tsv|txt|dat)$/i.test(path)
const SIZER_FILTERS = [{ name: 'Sizer export', extensions: ['csv', 'tsv', 'txt', 'dat'] }, { name: 'All files', extensions: ['*'] }]

const page = appPage(process.env['ELECTRON_RENDERER_URL'], join(import.meta.dirname, '../renderer/index.html'))
const preloadPath = join(import.meta.dirname, '../preload/index.cjs')
const iconPath = windowIconPath(import.meta.dirname)
const windows = new WindowRegistry()
const studies = new StudyFiles()
const recent = new RecentStudies(join(app.getPath('userData'), 'recent.json'))
const recovery = new RecoveryStore(join(app.getPath('userData'), 'recovery'))

const messageOf = (e: unknown) => (e instanceof Error ? e.message : String(e))

// ---------------------------------------------------------------------------------------------------------------
// Windows: one per study.

/** Sends a checked message to a window's page. */
function sendTo<N extends 'command' | 'load'>(contents: WebContents, name: N, message: ChannelMessage<N>): void {
  contents.send(CHANNELS[name], checkMessage(name, message))
}

function openWindow(startUp: StartUp, recoverySlot = recovery.newSlot()): BrowserWindow {
  const win = new BrowserWindow(windowOptions(preloadPath, iconPath))
  const contents = win.webContents
  const id = contents.id
  windows.add(id, startUp, recoverySlot)
  win.once('ready-to-show', () => win.show())

  win.on('close', (e) => {
    const record = windows.get(id)
    if (!record || onCloseRequest(record) === 'close') return
    e.preventDefault()
    const answer = closeAnswer(dialog.showMessageBoxSync(win, unsavedChangesQuestion(record.title)))
    if (answer === 'save-then-close') sendTo(contents, 'command', 'save-and-close')
    else if (answer === 'close-without-saving') {
      record.closing = true
      win.close()
    }
  })
  win.on('closed', () => {
    const record = windows.remove(id)
    if (record) void recovery.discard(record.recoverySlot).catch((e: unknown) => console.warn(`Recovery copy not removed: ${messageOf(e)}`))
  })

  void win.loadURL(page.url.href)
  return win
}

/** Keeps every page on the app: no navigation elsewhere, no new windows, no webviews. */
function guardContents(contents: WebContents): void {
  const refuseUnlessApp = (e: { preventDefault(): void }, url: string) => {
    if (!isAppPage(url, page)) e.preventDefault()
  }
  contents.on('will-navigate', (e, url) => refuseUnlessApp(e, url))
  contents.on('will-frame-navigate', (e) => refuseUnlessApp(e, e.url))
  contents.on('will-redirect', (e, url) => refuseUnlessApp(e, url))
  contents.on('will-attach-webview', (e) => e.preventDefault())
  contents.setWindowOpenHandler(() => windowOpenResponse())
}

/** No permissions, and the app's Content-Security-Policy on every response (the dev server's included). */
function guardSession(): void {
  const s = session.defaultSession
  s.setPermissionRequestHandler((_contents, permission, done) => done(permissionAllowed(permission)))
  s.webRequest.onHeadersReceived((details, done) => done({ responseHeaders: withContentPolicy(details.responseHeaders) }))
}

// ---------------------------------------------------------------------------------------------------------------
// Studies and the recent list.

/** Puts a study at the top of File ▸ Open recent; a failure here never fails the open or save that caused it. */
async function rememberStudy(path: string): Promise<void> {
  try {
    await recent.add(path)
    app.addRecentDocument(path)
    await buildMenu()
  } catch (e) {
    console.warn(`The recent-studies list was not updated: ${messageOf(e)}`)
  }
}

/** Opens a study file: into `win` when it holds nothing yet (resolves to the file), else in a window of its own. */
async function openStudyFile(path: string, win: BrowserWindow | null): Promise<OpenedFile | null> {
  let file: OpenedFile
  try {
    file = await studies.read(path)
  } catch (e) {
    dialog.showErrorBox('Could not open the study', messageOf(e))
    await buildMenu().catch(() => {})
    return null
  }
  await rememberStudy(path)
  const id = win && !win.isDestroyed() ? win.webContents.id : undefined
  if (id !== undefined && windows.opensInto(id) === 'this-window') {
    windows.grant(id, path)
    return file
  }
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
// IPC: a message is acted on only if it comes from the main frame of a study window showing the app's page, and
// matches its channel's schema.

function senderRecord(e: IpcMainInvokeEvent | IpcMainEvent): WindowRecord {
  const frame = e.senderFrame
  if (!frame || frame.parent !== null || !isAppPage(frame.url, page)) {
    throw new Error(`A message came from ${frame?.url ?? 'a closed frame'}, which is not the app's page; it was ignored.`)
  }
  return windows.require(e.sender.id)
}

function windowOf(e: IpcMainInvokeEvent | IpcMainEvent): BrowserWindow {
  const win = BrowserWindow.fromWebContents(e.sender)
  if (!win) throw new Error('The message came from web contents without a window; it was ignored.')
  return win
}

function handle<N extends ChannelName>(name: N, fn: (e: IpcMainInvokeEvent, arg: ChannelMessage<N>, record: WindowRecord) => Promise<unknown>): void {
  ipcMain.handle(CHANNELS[name], async (e, raw: unknown) => {
    const record = senderRecord(e)
    return fn(e, checkMessage(name, raw), record)
  })
}

/** One-way messages cannot answer, so a refused one is only logged. */
function listen<N extends ChannelName>(name: N, fn: (e: IpcMainEvent, arg: ChannelMessage<N>, record: WindowRecord) => void): void {
  ipcMain.on(CHANNELS[name], (e, raw: unknown) => {
    try {
      fn(e, checkMessage(name, raw), senderRecord(e))
    } catch (err) {
      console.warn(messageOf(err))
    }
  })
}

function registerIpc(): void {
  handle('startUp', async (_e, _arg, record) => record.startUp)

  handle('openStudy', async (e) => askAndOpenStudy(windowOf(e)))

  handle('saveStudy', async (e, req) => {
    const win = windowOf(e)
    let path = windows.savePathWithoutAsking(e.sender.id, req)
    if (!path) {
      const r = await dialog.showSaveDialog(win, { title: 'Save the study', defaultPath: req.path ?? req.suggestedName, filters: [FILE_FILTERS.study] })
      if (r.canceled || !r.filePath) return null
      path = r.filePath
    }
    try {
      if (!(await studies.save(path, req.text, (p) => overwriteChosen(dialog.showMessageBoxSync(win, overwriteQuestion(p)))))) return null
    } catch (err) {
      dialog.showErrorBox('The study was not saved', `${path}\n\n${messageOf(err)}\n\nThe file on disk is as it was; save under another name or in another folder.`)
      return null
    }
    windows.grant(e.sender.id, path)
    await rememberStudy(path)
    return { name: basename(path), path }
  })

  handle('openSizer', async (e) => {
    const r = await dialog.showOpenDialog(windowOf(e), { title: 'Import a sizer file', properties: ['openFile'], filters: SIZER_FILTERS })
    if (r.canceled || r.filePaths.length === 0) return null
    try {
      return (await readChosenFile(r.filePaths[0])).file
    } catch (err) {
      dialog.showErrorBox('Could not import the sizer file', messageOf(err))
      return null
    }
  })

  handle('openInstruments', async (e) => {
    const r = await dialog.showOpenDialog(windowOf(e), { title: 'Add instrument files to the campaign', properties: ['openFile', 'multiSelections'], filters: SIZER_FILTERS })
    if (r.canceled || r.filePaths.length === 0) return null
    const files = []
    for (const path of r.filePaths) {
      try {
        files.push(await readInstrumentFile(path))
      } catch (err) {
        dialog.showErrorBox('Could not read the instrument file', messageOf(err))
      }
    }
    return files
  })

  // Only table files (the kinds the open dialog offers), so a page cannot use it to read other files.
  handle('readInstrument', async (_e, path) => {
    if (!instrumentFileName(path)) return { missing: `${path} is not a table file (.csv, .tsv, .txt or .dat)` }
    try {
      return await readInstrumentFile(path)
    } catch (err) {
      return { missing: messageOf(err) }
    }
  })

  handle('exportFile', async (e, req) => {
    const r = await dialog.showSaveDialog(windowOf(e), { title: 'Export', defaultPath: req.suggestedName, filters: [FILE_FILTERS[req.kind]] })
    if (r.canceled || !r.filePath) return false
    try {
      await writeExport(r.filePath, exportContent(req))
      return true
    } catch (err) {
      dialog.showErrorBox('The export was not written', `${r.filePath}\n\n${messageOf(err)}\n\nChoose another name or folder.`)
      return false
    }
  })

  handle('printReport', async (e, req) => {
    const win = windowOf(e)
    const r = await dialog.showSaveDialog(win, { title: 'Save the report as PDF', defaultPath: req.suggestedName, filters: [FILE_FILTERS.pdf] })
    if (r.canceled || !r.filePath) return false
    try {
      await writeExport(r.filePath, await win.webContents.printToPDF({ printBackground: true, pageSize: 'A4', margins: { marginType: 'default' } }))
    } catch (err) {
      dialog.showErrorBox('The report was not saved', `${r.filePath}\n\n${messageOf(err)}\n\nChoose another name or folder.`)
      return false
    }
    void shell.openPath(r.filePath)
    return true
  })

  handle('keepRecovery', async (e, copy, record) => {
    if (copy !== null) await recovery.keep(record.recoverySlot, copy)
    // A copy written while its window was closing would be offered at the next start as if after a crash.
    if (copy === null || windows.get(e.sender.id) !== record) await recovery.discard(record.recoverySlot)
  })

  listen('setState', (e, state) => {
    windows.report(e.sender.id, state)
    const win = BrowserWindow.fromWebContents(e.sender)
    win?.setTitle(windowTitle(state.title, state.dirty))
    win?.setDocumentEdited(state.dirty)
  })

  listen('closeWindow', (e, _arg, record) => {
    record.closing = true
    BrowserWindow.fromWebContents(e.sender)?.close()
  })
}

// ---------------------------------------------------------------------------------------------------------------
// The application menu.

function runCommand(command: MenuCommand): void {
  const win = BrowserWindow.getFocusedWindow()
  if (command === 'new') openWindow({ blank: true })
  else if (command === 'open') void askAndOpenStudy(win).then((f) => f && win && !win.isDestroyed() && sendTo(win.webContents, 'load', f))
  else if (win) sendTo(win.webContents, 'command', command)
}

/** Opens a study chosen outside the app's dialogs (Open recent, the desktop): into the focused window if it is empty. */
function openInFocusedWindow(path: string): void {
  const win = BrowserWindow.getFocusedWindow()
  void openStudyFile(path, win).then((f) => f && win && !win.isDestroyed() && sendTo(win.webContents, 'load', f))
}

async function buildMenu(): Promise<void> {
  Menu.setApplicationMenu(Menu.buildFromTemplate(menuTemplate(process.platform, await recent.list(), { send: runCommand, openRecent: openInFocusedWindow })))
}

// ---------------------------------------------------------------------------------------------------------------
// Start-up.

/** Files the desktop asked to open (macOS sends them as events, also before the app is ready). */
const filesBeforeReady: string[] = []

async function openFirstWindows(): Promise<void> {
  const named = filesBeforeReady.shift() ?? studyArgument(process.argv, app.isPackaged, process.cwd())
  for (const first of firstWindows(await recovery.leftovers(), named)) {
    if ('recover' in first) {
      const slot = await recovery.adopt(first.recover)
      if (slot) openWindow({ recovery: first.recover.copy }, slot)
    } else if ('openFile' in first) {
      try {
        openWindow({ file: await studies.read(first.openFile) })
        await rememberStudy(first.openFile)
      } catch (e) {
        dialog.showErrorBox('Could not open the study', messageOf(e))
      }
    } else openWindow({})
  }
  if (windows.size === 0) openWindow({})
  for (const path of filesBeforeReady.splice(0)) await openStudyFile(path, null)
}

app.enableSandbox()
app.on('web-contents-created', (_e, contents) => guardContents(contents))
app.on('open-file', (e, path) => {
  e.preventDefault()
  if (app.isReady()) openInFocusedWindow(path)
  else filesBeforeReady.push(path)
})

void app.whenReady().then(async () => {
  guardSession()
  registerIpc()
  await buildMenu()
  await openFirstWindows()
  app.on('activate', () => {
    if (BrowserWindow.getAllWindows().length === 0) openWindow({})
  })
})

app.on('window-all-closed', () => {
  if (quitsWhenAllWindowsClose(process.platform)) app.quit()
})
