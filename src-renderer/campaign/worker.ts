// The campaign's record computed off the page's thread: the files in (their texts from the desktop; on a web page
// their bytes, read once by the page and moved here, so the page neither decodes a year of rows nor copies its
// text), the record's typed arrays out (transferred, not copied). All the work is src-core's buildCampaignRecord.
// A web page's sizer file is read here from its bytes as they come (`bytes`: src-core's readSizerBytes, the same
// reading as of the text they decode to, without that text), as the kind the page guesses for it (kind.ts), while
// the page's other files are still being read and while it adds the files and asks for the record; the record asked
// of this worker next takes what was read as the kind it is asked for (buildCampaignRecord's `ahead`), the same as
// reading it then, and reads the bytes again as another kind. The measured files are read by a partner worker
// (reader.ts) while this one reads the sizer: the page says which to wait for (`expect`) and passes their readings
// on (`partner`).
//
// The page keeps a worker whose record is done for the next record (session.ts), and the worker keeps what it read
// of each file (`kept`, by the page's serial) and the files as they came (`sources`: a web page's bytes, the
// desktop's texts): a changed parameter (the wavelength, the sample, the time step) then reads no measured file
// again, and a sizer whose rows went to the page with the record is read again from its bytes, not from its blob
// decoded. Each record is given its own copy of a kept reading's summary (readingForAnotherRecord). (The optics
// workspace is not kept: a Mie node's last bit can depend on the order the nodes were found in, and a record's
// figures should not depend on the records before it.)
import { buildCampaignRecord, InputError, isSizerKind, readCampaignInstrument, readingForAnotherRecord, readSizerBytes, readSizerPart, unpackInstrument, type CampaignBuild, type CampaignFileKind, type CampaignInput, type CampaignSettings, type ReadAhead, type Study } from '../../src-core/index.ts'
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
/** What the last record read of each of its files (by the page's serial), for the next record. */
let kept = new Map<number, ReadAhead>()
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

/** A file as the last record was given it: its bytes (a web page's), else its text. */
type Source = { kind: CampaignFileKind; name: string; bytes?: Uint8Array; text?: string }
/** The last record's files as they came (by serial), from which a reading moved to the page is made again. */
let sources = new Map<number, Source>()

/** What a file's reading is made from: a sizer's bytes as they are, else the text. */
const contentOf = (s: Source): string | ReturnType<typeof readSizerBytes> => (s.bytes && isSizerKind(s.kind) ? readSizerBytes({ kind: s.kind, name: s.name }, s.bytes) : textOfSource(s))
const textOfSource = (s: Source): string => s.text ?? new TextDecoder().decode(s.bytes)

/** Reads a file ahead as the kind the page guessed for it; a fault here is left for the record's own reading to meet. */
function readAhead(serial: number, name: string, kind: CampaignFileKind, bytes: Uint8Array): void {
  const r = reading(kind, name, () => contentOf({ kind, name, bytes }))
  if (r) ahead.set(serial, r)
  else ahead.delete(serial)
}

/**
 * A file read as `kind` from its text (or a sizer's from its bytes, as a part), or undefined where the reading
 * throws: the record's own reading then meets the fault and says it in the file's summary.
 */
function reading(kind: CampaignFileKind, name: string, from: () => string | ReturnType<typeof readSizerBytes>): ReadAhead | undefined {
  try {
    const got = from()
    if (typeof got !== 'string') return { kind, name, part: got }
    return isSizerKind(kind) ? { kind, name, part: readSizerPart({ kind, name, text: got }) } : { kind, name, instrument: readCampaignInstrument({ kind, name, text: got }) }
  } catch {
    return undefined
  }
}

/**
 * A record's arrays may be a kept reading's own (a single sizer's values are the record's values): those are moved to
 * the page as they are, and the reading is made again from the file as it came (`sources`) when the next record asks
 * for it. (Keeping a copy took 0.4 s of a year's record on the test machine, on the way to the page's charts; reading
 * it again in the background while the page draws took processors from the page and the optics workers.)
 */
function dropMoved(moved: Set<ArrayBufferLike>): void {
  for (const [serial, r] of kept) {
    if (!('part' in r)) continue
    const { values, timesMs, rh } = r.part
    if (moved.has(values.buffer) || moved.has(timesMs.buffer) || (rh && moved.has(rh.buffer))) kept.delete(serial)
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
    // a file read ahead, or by the last record, as the kind asked needs no text
    const fits = (r: ReadAhead | undefined, i: RecordWorkerInput) => r?.kind === i.kind && r?.name === i.name
    const known = (i: RecordWorkerInput) => [ahead.get(i.serial), kept.get(i.serial)].find((r) => fits(r, i))
    // each file as it came, where that costs nothing (bytes or a text this worker holds); else, if it must be read,
    // from its blob
    const at = (i: RecordWorkerInput): Source | undefined => {
      const bytes = held.get(i.serial) ?? sources.get(i.serial)?.bytes
      const text = 'text' in i ? i.text : (read.get(i.serial) ?? sources.get(i.serial)?.text)
      return bytes ? { kind: i.kind, name: i.name, bytes } : text !== undefined ? { kind: i.kind, name: i.name, text } : undefined
    }
    const given = await Promise.all(d.inputs.map(async (i) => at(i) ?? (known(i) || !('blob' in i) ? undefined : { kind: i.kind, name: i.name, text: await readText(i.blob) })))
    const readings = d.inputs.map((i, k) => known(i) ?? (given[k] && reading(i.kind, i.name, () => contentOf(given[k]!))))
    // a file that could not be read goes to the record as text: its own reading says what is wrong
    const inputs: CampaignInput[] = d.inputs.map((i, k) => ({ kind: i.kind, name: i.name, text: readings[k] || !given[k] ? '' : textOfSource(given[k]) }))
    kept = new Map()
    sources = new Map()
    d.inputs.forEach((i, k) => {
      if (readings[k]) kept.set(i.serial, readings[k])
      if (given[k]) sources.set(i.serial, given[k])
    })
    read.clear()
    held.clear()
    ahead.clear()
    expected.clear()
    let last = 0
    // the figures at the wavelengths the charts draw; the export computes the others (recordCsv, completeRecord)
    const build = buildCampaignRecord(inputs, settings, study, {
      figures: 'charts',
      ahead: readings.map((r) => r && readingForAnotherRecord(r)),
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
    dropMoved(new Set(transfer))
  } catch (err) {
    if (err instanceof InputError) post({ job, type: 'failed', message: err.message, fix: err.fix })
    else post({ job, type: 'failed', message: (err as Error)?.message ?? String(err), fix: 'This is a fault of the program; please report it with the files.' })
  }
}
