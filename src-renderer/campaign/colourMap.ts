// The record's size distribution as a time–diameter colour map: each pixel of the plot takes the row whose step
// holds its time and the bin that holds its diameter, coloured by log₁₀ dN/dlogD on a scale of its own
// (dark violet through blue and green to pale yellow: lightness rises steadily, so it reads in grey and for
// colour-blind readers). Drawn as one ImageData per redraw, so its cost follows the plot's pixels, not the rows;
// each cell's colour is worked out once, the first time its row is drawn.
import type uPlot from 'uplot'
import { lastAtOrBelow, type CampaignRecord } from '../../src-core/index.ts'

const ANCHORS: [number, number, number][] = [
  [38, 20, 66],
  [40, 70, 140],
  [34, 138, 150],
  [110, 190, 90],
  [246, 232, 120]
]

/** 256 colours from low to high. */
export const COLOUR_TABLE: Uint8ClampedArray = (() => {
  const out = new Uint8ClampedArray(256 * 3)
  for (let i = 0; i < 256; i++) {
    const f = (i / 255) * (ANCHORS.length - 1)
    const a = Math.min(ANCHORS.length - 2, Math.floor(f))
    const t = f - a
    for (let c = 0; c < 3; c++) out[i * 3 + c] = ANCHORS[a][c] + t * (ANCHORS[a + 1][c] - ANCHORS[a][c])
  }
  return out
})()

export const colourCss = (share: number): string => {
  const i = Math.max(0, Math.min(255, Math.round(share * 255))) * 3
  return `rgb(${COLOUR_TABLE[i]},${COLOUR_TABLE[i + 1]},${COLOUR_TABLE[i + 2]})`
}

/**
 * The colour scale's ends, log₁₀ dN/dlogD, in half decades: the 99.5th percentile of the positive values (a sample
 * of them) at the top, and the 1st percentile but at most five decades below it at the bottom (lower values take
 * the lowest colour), so that the tails of the bins do not flatten the map.
 */
export function colourRange(r: CampaignRecord): [number, number] {
  const step = Math.max(1, Math.floor(r.dNdlogD.length / 200_000))
  const all = new Float64Array(Math.ceil(r.dNdlogD.length / step))
  let n = 0
  for (let i = 0; i < r.dNdlogD.length; i += step) if (r.dNdlogD[i] > 0) all[n++] = Math.log10(r.dNdlogD[i])
  if (n === 0) return [0, 1]
  // a typed array's own numeric sort (the values are finite): the order a comparison of numbers gives, much quicker
  const v = all.subarray(0, n).sort()
  const hi = v[Math.floor(0.995 * (v.length - 1))]
  const lo = Math.max(v[Math.floor(0.01 * (v.length - 1))], hi - 5)
  return hi > lo ? [Math.floor(lo * 2) / 2, Math.ceil(hi * 2) / 2] : [lo - 1, lo + 1]
}

/** The row whose step holds time t (ms), or −1. */
function rowAt(r: CampaignRecord, t: number): number {
  const s = r.times
  const lo = lastAtOrBelow(s, t)
  if (lo < 0) return -1
  const end = Math.min(s[lo] + r.intervalMs, lo + 1 < s.length ? s[lo + 1] : Infinity)
  return t < end && r.present[lo] ? lo : -1
}

/** The colour table as one 32-bit RGBA word per colour, in the byte order of the platform (for a Uint32Array view). */
const PACKED: Uint32Array = (() => {
  const out = new Uint32Array(256)
  const bytes = new Uint8ClampedArray(out.buffer)
  for (let i = 0; i < 256; i++) bytes.set([COLOUR_TABLE[i * 3], COLOUR_TABLE[i * 3 + 1], COLOUR_TABLE[i * 3 + 2], 255], i * 4)
  return out
})()

/** Kept between redraws: the colours by bin and pixel column (grown as needed), and the image. */
let byBin = new Uint32Array(0)
let image: ImageData | null = null

/** Where the platform keeps a double's high 32 bits (sign, exponent, the mantissa's top 20) in a Uint32Array view. */
const HI = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1 ? 1 : 0
const BUCKET_SHIFT = 12 // a bucket: the high word's top 20 bits, 1/256 of an octave

/**
 * The rule without a logarithm per value (Math.log10 was about 80 ns a value here, so a zoom's new rows cost
 * 10–60 ms): for each colour k (1–255) the least double whose shade by the rule is k or more, found once per scale
 * by bisection of the rule itself, so that a value's shade is how many of them it reaches; a value's bucket (its
 * high word's top bits) gives the count at the bucket's start, and a bucket that holds a threshold (about one in
 * twenty) compares the value with it. The same colours as the rule, round((log₁₀ v − a) × scale) held to 0–255 (it
 * rises with the value; test/renderer/colourMap.test.ts checks it at every colour's edge).
 */
export interface ShadeLookup {
  /** thresholds[k]: the least double of shade ≥ k (k = 1–255; [0] unused). */
  thresholds: Float64Array
  /** The first bucket of the table; a lower one is shade 0. */
  first: number
  /** Per bucket from `first`: the shade of its least value; past the table, 255. */
  table: Uint8Array
}

export function shadeLookup(a: number, scale: number): ShadeLookup {
  const rule = (v: number) => Math.round((Math.log10(v) - a) * scale)
  const thresholds = new Float64Array(256)
  for (let k = 1; k < 256; k++) {
    const t = 10 ** (a + (k - 0.5) / scale)
    if (!(t > 0 && t < Infinity)) {
      thresholds[k] = t > 0 ? Infinity : Number.MIN_VALUE
      continue
    }
    let lo = t
    let hi = t
    while (lo > 0 && rule(lo) >= k) lo *= 0.999
    while (hi < Infinity && rule(hi) < k) hi *= 1.001
    for (;;) {
      const mid = lo + (hi - lo) / 2
      if (mid <= lo || mid >= hi) break
      if (rule(mid) >= k) hi = mid
      else lo = mid
    }
    thresholds[k] = Math.max(hi, thresholds[k - 1])
  }
  const word = new Float64Array(1)
  const bits = new Uint32Array(word.buffer)
  const bucketOf = (v: number) => ((word[0] = v), bits[HI] >>> BUCKET_SHIFT)
  const first = bucketOf(thresholds[1])
  const last = bucketOf(thresholds[255] < Infinity ? thresholds[255] : Number.MAX_VALUE)
  const table = new Uint8Array(last - first + 1)
  let k = 0
  for (let b = first; b <= last; b++) {
    bits[HI] = b << BUCKET_SHIFT
    bits[1 - HI] = 0
    while (k < 255 && thresholds[k + 1] <= word[0]) k++
    table[b - first] = k
  }
  return { thresholds, first, table }
}

/** Each cell's colour (0–255) on the scale, worked out the first time its row is drawn (one byte a cell). */
interface Shades {
  range: [number, number]
  shade: Uint8Array
  done: Uint8Array
  lookup: ShadeLookup
  /** The record's dN/dlogD as 32-bit words. */
  words: Uint32Array
}
const shadesByRecord = new WeakMap<CampaignRecord, Shades>()

function shadesOf(r: CampaignRecord, range: [number, number]): Shades {
  let s = shadesByRecord.get(r)
  if (!s || s.range[0] !== range[0] || s.range[1] !== range[1]) {
    const lookup = shadeLookup(range[0], 255 / (range[1] - range[0]))
    s = { range: [range[0], range[1]], shade: new Uint8Array(r.times.length * r.bins), done: new Uint8Array(r.times.length), lookup, words: wordsOf(r.dNdlogD) }
    shadesByRecord.set(r, s)
  }
  return s
}

/** The shades of `count` values of `v` from `from` into `out` from `at` (`words`: `v` as 32-bit words). */
export function shadeRun(v: Float64Array, words: Uint32Array, from: number, count: number, lookup: ShadeLookup, out: Uint8Array, at: number): void {
  const { thresholds, first, table } = lookup
  const size = table.length
  for (let i = 0; i < count; i++) {
    const x = v[from + i]
    let k = 0
    if (x > 0) {
      const b = (words[2 * (from + i) + HI] >>> BUCKET_SHIFT) - first
      if (b >= size) k = 255
      else if (b >= 0) {
        k = table[b]
        while (k < 255 && x >= thresholds[k + 1]) k++
      }
    }
    out[at + i] = k
  }
}

/** A Uint32Array on the same memory as `v`, two words a value. */
const wordsOf = (v: Float64Array) => new Uint32Array(v.buffer, v.byteOffset, v.length * 2)

/**
 * Draws the map into the plot area of `u` (x in s, y in µm on a log scale). Each pixel column takes its row's colours
 * bin by bin (a shade a bin, not a pixel; a column of the same row as the one before copies it), kept bin by
 * bin across the columns, so that each pixel row of the image is one bin's run of colours, copied whole.
 */
export function drawColourMap(u: uPlot, r: CampaignRecord, range: [number, number]): void {
  const { left, top, width, height } = u.bbox
  if (width < 1 || height < 1) return
  const ratio = width / u.over.clientWidth || 1
  const iw = Math.round(width)
  const ih = Math.round(height)
  // the image of the last redraw when its size is the same: every pixel is written again (a fresh one each redraw
  // was most of a megabyte of new memory)
  if (!image || image.width !== iw || image.height !== ih) image = u.ctx.createImageData(iw, ih)
  const img = image
  const w = img.width
  const e = r.edgesUm
  const bins = r.bins
  const binOf = new Int32Array(img.height)
  for (let y = 0; y < img.height; y++) {
    const d = u.posToVal(y / ratio, 'y')
    // the bin whose lower edge is the last at or below d (bins are e[b] .. e[b + 1])
    binOf[y] = d < e[e.length - 1] ? lastAtOrBelow(e, d, e.length - 1) : -1
  }
  const { shade, done, lookup, words } = shadesOf(r, range)
  if (byBin.length < bins * w) byBin = new Uint32Array(bins * w)
  const cols = byBin
  let before = -1
  for (let x = 0; x < w; x++) {
    const row = rowAt(r, u.posToVal(x / ratio, 'x') * 1000)
    if (row < 0) {
      // a gap: no colour
      for (let b = 0, o = x; b < bins; b++, o += w) cols[o] = 0
      before = -1
      continue
    }
    if (row === before) {
      for (let b = 0, o = x; b < bins; b++, o += w) cols[o] = cols[o - 1]
      continue
    }
    before = row
    const base = row * bins
    if (!done[row]) {
      shadeRun(r.dNdlogD, words, base, bins, lookup, shade, base)
      done[row] = 1
    }
    for (let b = 0, o = x; b < bins; b++, o += w) cols[o] = PACKED[shade[base + b]]
  }
  const px = new Uint32Array(img.data.buffer)
  for (let y = 0; y < img.height; y++) {
    const b = binOf[y]
    if (b >= 0) px.set(cols.subarray(b * w, b * w + w), y * w)
    else px.fill(0, y * w, y * w + w)
  }
  u.ctx.putImageData(img, Math.round(left), Math.round(top))
}
