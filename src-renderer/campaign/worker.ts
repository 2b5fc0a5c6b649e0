// The campaign's record computed off the page's thread: the files in (their texts from the desktop; on a web page
// the files themselves, read as bytes here, so the page neither decodes a year of rows nor copies its text), the
// record's typed arrays out (transferred, not copied). All the work is src-core's buildCampaignRecord.
import { buildCampaignRecord, InputError, type CampaignBuild, type CampaignInput, type CampaignSettings, type Study } from '../../src-core/index.ts'

/** A file as the page sends it: its text, or the file to read here; `size` is the text's length (the page's key). */
export type RecordWorkerInput = Omit<CampaignInput, 'text'> & { size: number } & ({ text: string } | { blob: Blob })
export type ToRecordWorker = { job: number; inputs: RecordWorkerInput[]; settings: CampaignSettings; study: Pick<Study, 'samples' | 'user_materials' | 'wavelengths_nm'> }
export type FromRecordWorker =
  | { job: number; type: 'progress'; share: number }
  | { job: number; type: 'done'; build: CampaignBuild; ms: number }
  | { job: number; type: 'failed'; message: string; fix: string }

self.onmessage = async (e: MessageEvent<ToRecordWorker>) => {
  const { job, settings, study } = e.data
  const started = performance.now()
  const post = (m: FromRecordWorker, transfer: Transferable[] = []) => (self as unknown as Worker).postMessage(m, transfer)
  try {
    // the three files' bytes are fetched side by side; each is decoded as a whole (UTF-8, as File.text())
    const inputs: CampaignInput[] = await Promise.all(e.data.inputs.map(async (i) => ({ kind: i.kind, name: i.name, text: 'text' in i ? i.text : await i.blob.text() })))
    let last = 0
    // the figures at the wavelengths the charts draw; the export computes the others (recordCsv, completeRecord)
    const build = buildCampaignRecord(inputs, settings, study, {
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
