// Preload: exposes a small typed API to the renderer. Every message is validated in the main process.
import { contextBridge } from 'electron'

contextBridge.exposeInMainWorld('motebenchHost', { kind: 'desktop' as const })
