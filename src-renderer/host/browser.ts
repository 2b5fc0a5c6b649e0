// The host in a plain web page: a file input to open, a download to save, localStorage for the recovery copy,
// the browser's print dialog for the report. Nothing leaves the machine.
import type { ExportKind, Host, InstrumentFile, OpenedFile, RecoveryCopy, StartUp } from '../../src-main/host-api.ts'

const RECOVERY_KEY = 'motebench.recovery'
const ACCEPT: Record<'study' | 'sizer', string> = { study: '.mote,.json,application/json', sizer: '.csv,.tsv,.txt,.dat,text/csv,text/plain' }
const MIME: Record<ExportKind, string> = { csv: 'text/csv', json: 'application/json', png: 'image/png', pdf: 'application/pdf', study: 'application/json' }

/** Opens the browser's file chooser; resolves to null when the user cancels. */
function chooseFile(accept: string): Promise<OpenedFile | null> {
  return new Promise((resolve) => {
    const input = document.createElement('input')
    input.type = 'file'
    input.accept = accept
    input.style.display = 'none'
    input.dataset['role'] = 'file-chooser'
    document.body.append(input)
    const done = (v: OpenedFile | null) => {
      input.remove()
      resolve(v)
    }
    input.addEventListener('cancel', () => done(null))
    input.addEventListener('change', () => {
      const f = input.files?.[0]
      if (!f) return done(null)
      void f.text().then((text) => done({ name: f.name, text }))
    })
    input.click()
  })
}

/** The file chooser for several files, given as they are (not read here); null when the user cancels. */
function chooseFiles(accept: string): Promise<InstrumentFile[] | null> {
  return new Promise((resolve) => {
    const input = document.createElement('input')
    input.type = 'file'
    input.accept = accept
    input.multiple = true
    input.style.display = 'none'
    input.dataset['role'] = 'file-chooser'
    document.body.append(input)
    const done = (v: InstrumentFile[] | null) => {
      input.remove()
      resolve(v)
    }
    input.addEventListener('cancel', () => done(null))
    input.addEventListener('change', () => {
      const list = [...(input.files ?? [])]
      if (list.length === 0) return done(null)
      done(list.map((f) => ({ name: f.name, blob: f })))
    })
    input.click()
  })
}

function download(name: string, blob: Blob): void {
  const url = URL.createObjectURL(blob)
  const a = document.createElement('a')
  a.href = url
  a.download = name
  a.style.display = 'none'
  document.body.append(a)
  a.click()
  a.remove()
  setTimeout(() => URL.revokeObjectURL(url), 10_000)
}

function fromBase64(b64: string): Uint8Array<ArrayBuffer> {
  const bin = atob(b64)
  const out = new Uint8Array(bin.length)
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i)
  return out
}

function readRecovery(): RecoveryCopy | undefined {
  try {
    const raw = localStorage.getItem(RECOVERY_KEY)
    if (!raw) return undefined
    const v = JSON.parse(raw) as RecoveryCopy
    return typeof v.text === 'string' && typeof v.savedAt === 'string' ? v : undefined
  } catch {
    return undefined
  }
}

export function browserHost(): Host {
  return {
    kind: 'browser',
    async startUp(): Promise<StartUp> {
      const recovery = readRecovery()
      return recovery ? { recovery } : {}
    },
    openStudy: () => chooseFile(ACCEPT.study),
    async saveStudy(req) {
      download(req.suggestedName, new Blob([req.text], { type: MIME.study }))
      return { name: req.suggestedName }
    },
    openSizerFile: () => chooseFile(ACCEPT.sizer),
    openInstrumentFiles: () => chooseFiles(ACCEPT.sizer),
    async readInstrumentFile(path) {
      return { missing: `a web page cannot open ${path} by its path` }
    },
    async exportFile(req) {
      const data = req.base64 !== undefined ? fromBase64(req.base64) : (req.text ?? '')
      download(req.suggestedName, new Blob([data], { type: MIME[req.kind] }))
      return true
    },
    async printReport() {
      window.print()
      return true
    },
    async keepRecovery(copy) {
      try {
        if (copy) localStorage.setItem(RECOVERY_KEY, JSON.stringify(copy))
        else localStorage.removeItem(RECOVERY_KEY)
      } catch {
        /* storage full or disabled: no recovery copy */
      }
    },
    setState(state) {
      document.title = `${state.title}${state.dirty ? ' •' : ''} — Motebench`
      window.onbeforeunload = state.dirty ? (e) => e.preventDefault() : null
    },
    onCommand: () => () => {},
    onLoad: () => () => {},
    closeWindow: () => window.close()
  }
}
