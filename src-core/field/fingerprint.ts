/**
 * Fingerprints of an instrument file's text, kept with its reference in the study (`campaign.files[].hash`) to say
 * when the file changed: FNV-1a, 32 bits (Fowler, Noll & Vo 1991; each UTF-16 code unit mixed as one step), as 8
 * hex digits. Not a security hash. Two forms:
 * - `textFingerprint`: the text's length, its first and its last FINGERPRINT_SPAN characters. What the web page
 *   keeps (it holds the text of a year of rows and should not pass over all of it); an edit in the middle of a
 *   long file alone goes unnoticed.
 * - `wholeTextFingerprint`: every character, written "whole:" + 8 hex digits. What the desktop keeps: its host
 *   reads the whole file anyway and fingerprints it there (src-main/study-saving.ts), off the page.
 * This file imports nothing, so the desktop's main process can use it alone.
 */

/** Characters of a text's beginning and of its end that `textFingerprint` reads. */
export const FINGERPRINT_SPAN = 1 << 16
const OFFSET = 0x811c9dc5
const PRIME = 0x01000193
const hex = (h: number): string => (h >>> 0).toString(16).padStart(8, '0')

/** The prefix of a whole-text fingerprint. */
export const WHOLE_FINGERPRINT = 'whole:'

/** FNV-1a of the length, the first and the last FINGERPRINT_SPAN characters (see above). */
export function textFingerprint(text: string): string {
  const n = text.length
  const head = Math.min(n, FINGERPRINT_SPAN)
  return sampledFingerprint(n, text.slice(0, head), text.slice(Math.max(head, n - FINGERPRINT_SPAN)))
}

/**
 * `textFingerprint` of a text known only by its length and its two ends (the web page, which reads no more of a
 * year of rows than that): `head` its first min(length, FINGERPRINT_SPAN) characters, `tail` the characters
 * after those among its last FINGERPRINT_SPAN. The same number as `textFingerprint` of the whole text.
 */
export function sampledFingerprint(length: number, head: string, tail: string): string {
  let h = OFFSET
  const mix = (c: number) => {
    h ^= c
    h = Math.imul(h, PRIME)
  }
  mix(length & 0xffff)
  mix(length >>> 16)
  for (let i = 0; i < head.length; i++) mix(head.charCodeAt(i))
  for (let i = 0; i < tail.length; i++) mix(tail.charCodeAt(i))
  return hex(h)
}

/** FNV-1a of the length and every character: "whole:" + 8 hex digits. */
export function wholeTextFingerprint(text: string): string {
  let h = OFFSET
  const n = text.length
  h = Math.imul(h ^ (n & 0xffff), PRIME)
  h = Math.imul(h ^ (n >>> 16), PRIME)
  for (let i = 0; i < n; i++) h = Math.imul(h ^ text.charCodeAt(i), PRIME)
  return WHOLE_FINGERPRINT + hex(h)
}

/**
 * Whether a file a reference points at differs from the one added, and how, in words (undefined: the same, or
 * nothing was kept to tell). `whole` is the host's whole-text fingerprint of `text` when it made one; a kept
 * whole-text fingerprint is compared with it (or made here when the host made none), a kept sampled one with the
 * sampled fingerprint of the text.
 */
export function fileChange(ref: { size?: number; hash?: string }, text: string, whole?: string): string | undefined {
  if (!ref.hash) return undefined
  const now = ref.hash.startsWith(WHOLE_FINGERPRINT) ? (whole ?? wholeTextFingerprint(text)) : textFingerprint(text)
  if (now === ref.hash) return undefined
  return ref.size !== undefined && ref.size !== text.length ? `its size went from ${ref.size} to ${text.length} characters` : 'its contents differ'
}
