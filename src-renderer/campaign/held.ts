// An instrument file as the page holds it: the desktop gives its text (read in the main process), the web page the
// file itself, whose bytes the page reads once and measures here (a plain-ASCII file without decoding it: its length,
// beginning and sampled fingerprint) and then hands, moved rather than copied, to the record's worker, which decodes
// and reads them (campaign/worker.ts); the page decodes none of a year of rows.
import { FINGERPRINT_SPAN, sampledFingerprint, textFingerprint } from '../../src-core/index.ts'
import type { InstrumentFile } from '../../src-main/host-api.ts'

export interface HeldFile {
  /** This session's number for the file (the worker given its bytes keeps its text by it). */
  serial: number
  name: string
  path?: string
  /** The whole text (desktop; or a web page's file that is not plain ASCII, decoded here). */
  text?: string
  /** The file itself (web page), read in the worker. */
  blob?: Blob
  /** The text's length in UTF-16 code units (what a reference keeps as `size`). */
  size: number
  /** The text's first FINGERPRINT_SPAN characters (what `guessKind` reads). */
  head: string
  /** The desktop host's whole-text fingerprint, else the sampled one (src-core/field/fingerprint.ts). */
  fingerprint: string
}

let serials = 0
/** A new serial for a file to hold. */
export const nextSerial = (): number => ++serials

function fromText(name: string, text: string, path?: string, whole?: string): HeldFile {
  return { serial: nextSerial(), name, ...(path !== undefined ? { path } : {}), text, size: text.length, head: text.slice(0, FINGERPRINT_SPAN), fingerprint: whole ?? textFingerprint(text) }
}

/** True when every byte is below 0x80 (then the text has one UTF-16 unit per byte). */
function plainAscii(bytes: Uint8Array): boolean {
  const words = Math.floor(bytes.byteOffset % 4 === 0 ? bytes.length / 4 : 0)
  const w = new Uint32Array(bytes.buffer, bytes.byteOffset, words)
  let or = 0
  for (let i = 0; i < words; i++) or |= w[i]
  for (let i = words * 4; i < bytes.length; i++) or |= bytes[i]
  return (or & 0x80808080) === 0
}

/**
 * The file as the page keeps it, measured here. A file of plain ASCII (the instruments' exports) is measured from its
 * bytes: its length is its byte count, and its two ends give the same sampled fingerprint as the decoded text would.
 * Any other (a byte-order mark, accented names in a header) is decoded here, as the whole text was before.
 */
export async function holdFile(f: InstrumentFile): Promise<HeldFile> {
  if ('text' in f) return fromText(f.name, f.text, f.path, f.fingerprint)
  return holdBytes(f, new Uint8Array(await f.blob.arrayBuffer()))
}

/** `holdFile` of a chosen file whose bytes were read (the caller may then hand them to a record worker). */
export function holdBytes(f: { name: string; path?: string; blob: Blob }, bytes: Uint8Array): HeldFile {
  const path = f.path !== undefined ? { path: f.path } : {}
  if (!plainAscii(bytes)) return fromText(f.name, new TextDecoder().decode(bytes), f.path)
  const n = bytes.length
  const headEnd = Math.min(n, FINGERPRINT_SPAN)
  const ascii = new TextDecoder()
  const head = ascii.decode(bytes.subarray(0, headEnd))
  const tail = ascii.decode(bytes.subarray(Math.max(headEnd, n - FINGERPRINT_SPAN)))
  return { serial: nextSerial(), name: f.name, ...path, blob: f.blob, size: n, head, fingerprint: sampledFingerprint(n, head, tail) }
}
