// The record worker's partner (a web page's files): reads the measured files (scattering, absorption) as their bytes
// come from the page, while the record worker decodes and reads the sizer's, and hands each back packed
// (campaign-pack.ts: a few typed arrays and one text, transferred rather than cloned); the page passes it on to the
// record worker that holds the file (worker.ts), which takes it as read ahead, the same records as its own reading.
import { packedBuffers, packInstrument, readCampaignInstrument, type CampaignFileKind, type CampaignFileSummary, type PackedInstrument } from '../../src-core/index.ts'

export type ToReader = { serial: number; name: string; kind: CampaignFileKind; bytes: ArrayBuffer }
/** The file read (packed), refused with its summary, or (a fault) its text, for the record worker to read itself. */
export type FromReader = { serial: number; kind: CampaignFileKind; name: string } & ({ packed: PackedInstrument } | { refused: CampaignFileSummary } | { text: string })

const post = (m: FromReader, transfer: Transferable[] = []) => (self as unknown as Worker).postMessage(m, transfer)

self.onmessage = (e: MessageEvent<ToReader>) => {
  const { serial, name, kind, bytes } = e.data
  const text = new TextDecoder().decode(bytes)
  try {
    const r = readCampaignInstrument({ kind, name, text })
    if (!('records' in r)) return post({ serial, kind, name, refused: r.summary })
    const packed = packInstrument(r)
    post({ serial, kind, name, packed }, packedBuffers(packed))
  } catch {
    post({ serial, kind, name, text })
  }
}
