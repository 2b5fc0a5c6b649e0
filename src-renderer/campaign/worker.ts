// The campaign's record computed off the page's thread: the files in (their texts from the desktop; on a web page
// their bytes, read once by the page and moved here, so the page neither decodes a year of rows nor copies its
// text), the record's typed arrays out (transferred, not copied). All the work is src-core's buildCampaignRecord.
// A web page's sizer file is read here from its bytes as they come (`bytes`: src-core's readSizerBytes, the same
// reading as of the text they decode to, without that text), as the kind the page guesses for it (kind.ts), while
// the page's other files are still being read and while it adds the files and asks for the record; the bytes are
// kept for the record asked of this worker next, which takes what was read as the kind it is asked for
// (buildCampaignRecord's `ahead`), the same as reading it then, and decodes them only for another kind. The
// measured files are read by a partner worker (reader.ts) while this one reads the sizer: the page says which to
// wait for (`expect`) and passes their readings on (`partner`).
import { buildCampaignRecord, InputError, isSizerKind, readCampaignInstrument, readSizerBytes, unpackInstrument, type CampaignBuild, type CampaignFileKind, type CampaignInput, type CampaignSettings, type ReadAhead, type Study } from '../../src-core/index.ts'
import type { FromReader } from './reader.ts'

/** A file as the page sends it: its text, or the file (read here unless its bytes came first); `serial` is the page's. */
export type RecordWorkerInput = Omit<CampaignInput, 'text'> & { serial: number } & ({ text: string } | { blob: Blob })
export type ToRecordWorker =
  | { type: 'record'; job: number; inputs: RecordWorkerInput[]; settings: CampaignSettings; study: Pick<Study, 'samples' | 'user_materials' | 'wavelengths_nm'> }
  /** A plain-ASCII file's bytes, with the kind the page guessed for it. */
  | { type: 'bytes'; serial: number; name: string; kind: CampaignFileKind; bytes: ArrayBuffer }
  /** A file the partner worker reads: the record waits for its reading. */
  | { type: 'expect'; serial: number }
  /** The partner's reading of a file (or, when it failed, nothing: the file is then read here from its blob). */
  | ({ type: 'partner' } & (FromReader | { serial: number; failed: true }))
export type FromRecordWorker =
  | { job: number; type: 'progress'; share: number }
  | { job: number; type: 'done'; build: CampaignBuild; ms: number }
  | { job: number; type: 'failed'; message: string; fix: string }

/**
 * A file's text: its bytes decoded as UTF-8 (a byte-order mark dropped, as File.text() does). Not File.text(): in
 * Chromium the string that gives a year of rows was read about twice as slowly by the file readers (measured in a
 * worker: a scan of every line 230–300 ms against 145 ms for the decoded bytes and 110–125 ms for a text copied
 * from the page), and it took longer to come (0.96 s against 0.74 s for the 80 MB file).
 */
const readText = async (blob: Blob): Promise<string> => new TextDecoder().decode(await blob.arrayBuffer())

/** Texts of files a partner could not read, by the page's serial. */
const read = new Map<number, string>()
/** The page's bytes, by its serial. */
const held = new Map<number, Uint8Array>()
/** Files read ahead (by the page's serial): as the kind guessed for them. */
const ahead = new Map<number, ReadAhead>()
/** Files the partner worker reads (by serial): settled when its reading has come. */
const expected = new Map<number, { done: Promise<void>; settle: () => void }>()

function expect(serial: number): void {
  let settle = () => {}
  const done = new Promise<void>((ok) => (settle = ok))
  expected.set(serial, { done, settle })
}

/** The partner's reading of a file taken as read ahead (its records unpacked, bit for bit what it read). */
function fromPartner(m: Extract<ToRecordWorker, { type: 'partner' }>): void {
  if ('packed' in m) ahead.set(m.serial, { kind: m.kind, name: m.name, instrument: unpackInstrument(m.packed) })
  else if ('refused' in m) ahead.set(m.serial, { kind: m.kind, name: m.name, instrument: { summary: m.refused } })
  else if ('text' in m) read.set(m.serial, m.text)
  expected.get(m.serial)?.settle()
}

/** Reads a file ahead as the kind the page guessed for it; a fault here is left for the record's own reading to meet. */
function readAhead(serial: number, name: string, kind: CampaignFileKind, bytes: Uint8Array): void {
  try {
    ahead.set(serial, isSizerKind(kind) ? { kind, name, part: readSizerBytes({ kind, name }, bytes) } : { kind, name, instrument: readCampaignInstrument({ kind, name, text: new TextDecoder().decode(bytes) }) })
  } catch {
    ahead.delete(serial)
  }
}

const post = (m: FromRecordWorker, transfer: Transferable[] = []) => (self as unknown as Worker).postMessage(m, transfer)

self.onmessage = async (e: MessageEvent<ToRecordWorker>) => {
  const d = e.data
  if (d.type === 'bytes') {
    const bytes = new Uint8Array(d.bytes)
    held.set(d.serial, bytes)
    readAhead(d.serial, d.name, d.kind, bytes)
    return
  }
  if (d.type === 'expect') return expect(d.serial)
  if (d.type === 'partner') return fromPartner(d)
  const { job, settings, study } = d
  const started = performance.now()
  try {
    await Promise.all(d.inputs.map((i) => expected.get(i.serial)?.done))
    const readFirst = d.inputs.map((i) => ahead.get(i.serial))
    // a file read ahead as the kind asked needs no text (buildCampaignRecord takes its reading)
    const taken = (i: RecordWorkerInput, k: number) => readFirst[k]?.kind === i.kind && readFirst[k]?.name === i.name
    const textOf = async (i: RecordWorkerInput & { blob: Blob }): Promise<string> => {
      const bytes = held.get(i.serial)
      return bytes ? new TextDecoder().decode(bytes) : (read.get(i.serial) ?? (await readText(i.blob)))
    }
    const inputs: CampaignInput[] = await Promise.all(d.inputs.map(async (i, k) => ({ kind: i.kind, name: i.name, text: 'text' in i ? i.text : taken(i, k) ? '' : await textOf(i) })))
    read.clear()
    held.clear()
    ahead.clear()
    expected.clear()
    let last = 0
    // the figures at the wavelengths the charts draw; the export computes the others (recordCsv, completeRecord)
    const build = buildCampaignRecord(inputs, settings, study, {
      figures: 'charts',
      ahead: readFirst,
      onProgress: (share) => {
        const now = performance.now()
        if (now - last > 100) post({ job, type: 'progress', share })
        last = now
      }
    })
    const r = build.record
    // (a set: dNdlogD may be the values themselves, and a buffer listed twice cannot be transferred)
    const transfer = r ? [...new Set([r.times.buffer, r.present.buffer, r.values.buffer, r.dNdlogD.buffer, r.cells.buffer, r.measured.buffer])] : []
    post({ job, type: 'done', build, ms: performance.now() - started }, transfer as Transferable[])
  } catch (err) {
    if (err instanceof InputError) post({ job, type: 'failed', message: err.message, fix: err.fix })
    else post({ job, type: 'failed', message: (err as Error)?.message ?? String(err), fix: 'This is a fault of the program; please report it with the files.' })
  }
}
