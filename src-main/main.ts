// Electron main process: thin. Windows, menus, dialogs and files only; no physics here.
import { app, BrowserWindow } from 'electron'
import { join } from 'node:path'

function openWindow(): BrowserWindow {
  const win = new BrowserWindow({
    width: 1366,
    height: 768,
    title: 'Motebench',
    webPreferences: {
      preload: join(import.meta.dirname, '../preload/index.cjs'),
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false
    }
  })
  const devUrl = process.env['ELECTRON_RENDERER_URL']
  if (devUrl) void win.loadURL(devUrl)
  else void win.loadFile(join(import.meta.dirname, '../renderer/index.html'))
  return win
}

app.whenReady().then(() => {
  openWindow()
  app.on('activate', () => {
    if (BrowserWindow.getAllWindows().length === 0) openWindow()
  })
})

app.on('window-all-closed', () => {
  if (process.platform !== 'darwin') app.quit()
})
