// Preload (sandboxed, CommonJS): exposes the small typed host API as `window.motebenchHost`.
// It only forwards calls; the main process validates every message (src-main/ipc-schemas.ts).
import { contextBridge, ipcRenderer, type IpcRendererEvent } from 'electron'
import { CHANNELS, MENU_COMMANDS, type Host, type MenuCommand, type OpenedFile } from './host-api.ts'

function listen<T>(channel: string, accept: (v: unknown) => v is T, listener: (v: T) => void): () => void {
  const handler = (_e: IpcRendererEvent, value: unknown) => {
    if (accept(value)) listener(value)
  }
  ipcRenderer.on(channel, handler)
  return () => ipcRenderer.removeListener(channel, handler)
}

const isCommand = (v: unknown): v is MenuCommand => typeof v === 'string' && (MENU_COMMANDS as readonly string[]).includes(v)
const isFile = (v: unknown): v is OpenedFile =>
  typeof v === 'object' && v !== null && typeof (v as OpenedFile).name === 'string' && typeof (v as OpenedFile).text === 'string'

const host: Host = {
  kind: 'desktop',
  startUp: () => ipcRenderer.invoke(CHANNELS.startUp),
  openStudy: () => ipcRenderer.invoke(CHANNELS.openStudy),
  saveStudy: (req) => ipcRenderer.invoke(CHANNELS.saveStudy, req),
  openSizerFile: () => ipcRenderer.invoke(CHANNELS.openSizer),
  openInstrumentFiles: () => ipcRenderer.invoke(CHANNELS.openInstruments),
  readInstrumentFile: (path) => ipcRenderer.invoke(CHANNELS.readInstrument, path),
  exportFile: (req) => ipcRenderer.invoke(CHANNELS.exportFile, req),
  printReport: (req) => ipcRenderer.invoke(CHANNELS.printReport, req),
  keepRecovery: (copy) => ipcRenderer.invoke(CHANNELS.keepRecovery, copy),
  setState: (state) => ipcRenderer.send(CHANNELS.setState, state),
  onCommand: (listener) => listen(CHANNELS.command, isCommand, listener),
  onLoad: (listener) => listen(CHANNELS.load, isFile, listener),
  closeWindow: () => ipcRenderer.send(CHANNELS.closeWindow)
}

contextBridge.exposeInMainWorld('motebenchHost', host)
