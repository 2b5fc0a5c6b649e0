// Writing an export (CSV, JSON, PNG, PDF) where the user chose: text as UTF-8, images and PDFs as bytes.
import { writeFileAtomically } from './files.ts'

/** What goes into the file: the text, or the bytes the base64 stands for. */
export function exportContent(req: { text?: string; base64?: string }): string | Uint8Array {
  if (req.base64 !== undefined) return Buffer.from(req.base64, 'base64')
  if (req.text !== undefined) return req.text
  throw new Error('An export needs its content as text or as base64; the request had neither. This is a fault in the app: report it.')
}

/** Writes the export whole or not at all (a temporary file renamed over the target; no .bak: the dialog asked). */
export async function writeExport(path: string, content: string | Uint8Array): Promise<void> {
  await writeFileAtomically(path, content, { backup: false })
}
