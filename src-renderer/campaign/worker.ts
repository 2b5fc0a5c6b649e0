// The campaign's record computed off the page's thread: the files in (their texts from the desktop; on a web page
// the files themselves, read as bytes here, so the page neither decodes a year of rows nor copies its text), the
// record's typed arrays out (transferred, not copied). All the work is src-core's: the files read
// (readCampaignSizer, readCampaignInstrument, or a sizer in two parts), then the record made (campaignRecord).
// A web page's files are measured here first (`measure`: the text's length, beginning and sampled fingerprint, what
// the study's reference keeps), and their texts kept for the record asked of this worker next.
//
// Two of these workers share the reading (the machine's two cores): the one asked for the record (`record`) reads
// the first part of the sizer file while its partner (`read`, its texts decoded ahead by `hold`) reads the rest of
// it and the measured files, and hands them over packed (campaign-pack.ts) on a channel of their own. What the
// partner does not hand over (it failed, was lost, or the file was not cut) the first reads itself, so the record is
// always what one reader gives.
import {
  addCampaignFile,
  campaignRecord,
  checkCampaign,
  finishSizer,
  FINGERPRINT_SPAN,
  InputError,
  isSizerKind,
  packedBuffers,
  packInstrument,
  packSizerPart,
  partsJoin,
  readCampaignInstrument,
  readCampaignSizer,
  readSizerPart,
  sizerCut,
  textFingerprint,
  unpackInstrument,
  unpackSizerPart,
  type CampaignBuild,
  type CampaignFiles,
  type CampaignFileSummary,
  type CampaignInput,
  type CampaignSettings,
  type PackedInstrument,
  type PackedSizerPart,
  type ReadInstrument,
  type ReadSizer,
  type Study
} from '../../src-core/index.ts'

/** A file as the page sends it: its text, or the file (read here, or already by `measure`); `serial` is the page's. */
export type RecordWorkerInput = Omit<CampaignInput, 'text'> & { serial: number } & ({ text: string } | { blob: Blob })
/** What `measure` tells of a file: as held.ts measures it on the page. */
export type MeasuredFile = { serial: number; size: number; head: string; fingerprint: string }
/** What the partner reads: the measured files, and the sizer file (`split`) from the line at `share` of it on. */
export type PartnerPlan = { split?: { serial: number; share: number }; instruments: number[] }
export type ToRecordWorker =
  | { type: 'record'; job: number; inputs: RecordWorkerInput[]; settings: CampaignSettings; study: Pick<Study, 'samples' | 'user_materials' | 'wavelengths_nm'>; partner?: { port: MessagePort; plan: PartnerPlan } }
  | { type: 'read'; inputs: RecordWorkerInput[]; port: MessagePort; plan: PartnerPlan }
  | { type: 'measure'; id: number; files: { serial: number; blob: Blob }[] }
  | { type: 'hold'; files: { serial: number; blob: Blob }[] }
  | { type: 'partner-lost' }
export type FromRecordWorker =
  | { job: number; type: 'progress'; share: number }
  | { job: number; type: 'done'; build: CampaignBuild; ms: number }
  | { job: number; type: 'failed'; message: string; fix: string }
  | { type: 'measured'; id: number; files: MeasuredFile[] }
/** What the partner hands over, per file: its part or reading packed, a refusal, or nothing (read it yourself). */
type Handed = { serial: number } & ({ part: PackedSizerPart } | { instrument: PackedInstrument } | { refused: CampaignFileSummary } | { none: true })

/**
 * A file's text: its bytes decoded as UTF-8 (a byte-order mark dropped, as File.text() does). Not File.text(): in
 * Chromium the string that gives a year of rows was read about twice as slowly by the file readers (measured in a
 * worker: a scan of every line 230–300 ms against 145 ms for the decoded bytes and 110–125 ms for a text copied
 * from the page), and it took longer to come (0.96 s against 0.74 s for the 80 MB file).
 */
const readText = async (blob: Blob): Promise<string> => new TextDecoder().decode(await blob.arrayBuffer())

/** Texts read by `measure` or `hold` (being read: the promise), by the page's serial. */
const read = new Map<number, string | Promise<string>>()
const textOf = async (i: RecordWorkerInput): Promise<string> => ('text' in i ? i.text : ((await read.get(i.serial)) ?? (await readText(i.blob))))

const post = (m: FromRecordWorker, transfer: Transferable[] = []) => (self as unknown as Worker).postMessage(m, transfer)

/** The partner's hand-overs awaited by the record's worker, by serial; `lost` ends every wait with nothing. */
let waiting = new Map<number, (h: Handed | null) => void>()
const handed = new Map<number, Handed>()
const handOver = (serial: number): Promise<Handed | null> => {
  const h = handed.get(serial)
  if (h) return Promise.resolve(h)
  return new Promise((resolve) => waiting.set(serial, resolve))
}
function partnerLost(): void {
  for (const resolve of waiting.values()) resolve(null)
  waiting = new Map()
  lost = true
}
let lost = false

self.onmessage = async (e: MessageEvent<ToRecordWorker>) => {
  const d = e.data
  if (d.type === 'measure') {
    // each file's bytes fetched side by side and decoded whole
    const files = await Promise.all(
      d.files.map(async ({ serial, blob }) => {
        const text = await readText(blob)
        read.set(serial, text)
        return { serial, size: text.length, head: text.slice(0, FINGERPRINT_SPAN), fingerprint: textFingerprint(text) }
      })
    )
    post({ type: 'measured', id: d.id, files })
    return
  }
  if (d.type === 'hold') {
    for (const { serial, blob } of d.files) read.set(serial, readText(blob))
    return
  }
  if (d.type === 'partner-lost') return partnerLost()
  if (d.type === 'read') return partner(d)
  const { job, settings, study } = d
  const started = performance.now()
  try {
    checkCampaign(d.inputs, settings, study)
    const plan = d.partner?.plan
    if (d.partner) {
      d.partner.port.onmessage = (m: MessageEvent<Handed>) => {
        const resolve = waiting.get(m.data.serial)
        if (resolve) (waiting.delete(m.data.serial), resolve(m.data))
        else handed.set(m.data.serial, m.data)
      }
    }
    const files: CampaignFiles = { files: [], sizers: [], instruments: [] }
    // the files this worker reads itself first (a cut sizer's first part too), then those the partner hands over
    const fromPartner = (i: RecordWorkerInput) => plan !== undefined && (plan.instruments.includes(i.serial) || plan.split?.serial === i.serial)
    const order = [...d.inputs.filter((i) => !fromPartner(i)), ...d.inputs.filter(fromPartner)]
    const got = new Map<number, ReadSizer | ReadInstrument | { summary: CampaignFileSummary }>()
    for (const i of order) {
      const input: CampaignInput = { kind: i.kind, name: i.name, text: await textOf(i) }
      got.set(i.serial, isSizerKind(i.kind) ? await sizer(input, i.serial, settings, plan) : await instrument(input, i.serial, plan))
    }
    for (const i of d.inputs) addCampaignFile(files, got.get(i.serial)!)
    read.clear()
    let last = 0
    // the figures at the wavelengths the charts draw; the export computes the others (recordCsv, completeRecord)
    const build = campaignRecord(files, settings, study, {
      figures: 'charts',
      onProgress: (share) => {
        const now = performance.now()
        if (now - last > 100) post({ job, type: 'progress', share })
        last = now
      }
    })
    const r = build.record
    const transfer = r ? [r.times.buffer, r.present.buffer, r.values.buffer, r.dNdlogD.buffer, r.cells.buffer, r.measured.buffer] : []
    post({ job, type: 'done', build, ms: performance.now() - started }, transfer as Transferable[])
  } catch (err) {
    if (err instanceof InputError) post({ job, type: 'failed', message: err.message, fix: err.fix })
    else post({ job, type: 'failed', message: (err as Error)?.message ?? String(err), fix: 'This is a fault of the program; please report it with the files.' })
  }
}

/** A sizer file: its first part here and the rest from the partner when the plan cuts it, else read whole here. */
async function sizer(input: CampaignInput, serial: number, settings: CampaignSettings, plan?: PartnerPlan): Promise<ReadSizer | { summary: CampaignFileSummary }> {
  const cut = plan?.split?.serial === serial && !lost ? sizerCut(input, plan.split.share) : undefined
  if (!cut) return readCampaignSizer(input, settings.density_g_cm3)
  let head
  try {
    head = readSizerPart(input, undefined, cut.from)
  } catch (e) {
    if (!(e instanceof InputError)) throw e
    return readCampaignSizer(input, settings.density_g_cm3) // the same refusal, from the same first rows
  }
  const h = await handOver(serial)
  const tail = h && 'part' in h ? unpackSizerPart(h.part) : undefined
  if (!tail || !partsJoin(head, tail)) return readCampaignSizer(input, settings.density_g_cm3)
  try {
    return finishSizer(input, [head, tail], settings.density_g_cm3)
  } catch (e) {
    if (e instanceof InputError) return readCampaignSizer(input, settings.density_g_cm3)
    throw e
  }
}

/** A measured file: from the partner when the plan gives it one, else read here. */
async function instrument(input: CampaignInput, serial: number, plan?: PartnerPlan): Promise<ReadInstrument | { summary: CampaignFileSummary }> {
  if (plan?.instruments.includes(serial) && !lost) {
    const h = await handOver(serial)
    if (h && 'instrument' in h) return unpackInstrument(h.instrument)
    if (h && 'refused' in h) return { summary: h.refused }
  }
  return readCampaignInstrument(input)
}

/** The partner's part: the rest of the sizer file first (the record's worker waits for it soonest), then the measured files. */
async function partner(d: Extract<ToRecordWorker, { type: 'read' }>): Promise<void> {
  const give = (h: Handed, transfer: ArrayBuffer[] = []) => d.port.postMessage(h, transfer)
  const bySerial = new Map(d.inputs.map((i) => [i.serial, i]))
  const split = d.plan.split && bySerial.get(d.plan.split.serial)
  if (split && d.plan.split) {
    const serial = split.serial
    try {
      const input: CampaignInput = { kind: split.kind, name: split.name, text: await textOf(split) }
      const cut = sizerCut(input, d.plan.split.share)
      if (!cut) give({ serial, none: true })
      else {
        const part = packSizerPart(readSizerPart(input, cut))
        give({ serial, part }, packedBuffers(part))
      }
    } catch {
      give({ serial, none: true }) // the record's worker reads it whole, and says what is wrong with it
    }
  }
  for (const serial of d.plan.instruments) {
    const i = bySerial.get(serial)
    if (!i) continue
    try {
      const r = readCampaignInstrument({ kind: i.kind, name: i.name, text: await textOf(i) })
      if ('records' in r) {
        const instrument = packInstrument(r)
        give({ serial, instrument }, packedBuffers(instrument))
      } else give({ serial, refused: r.summary })
    } catch {
      give({ serial, none: true })
    }
  }
  read.clear()
}
