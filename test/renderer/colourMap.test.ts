// The station record's colour map (src-renderer/campaign/colourMap.ts): every pixel of the plot area takes the row
// whose step holds its time and the bin that holds its diameter, coloured by log₁₀ dN/dlogD on the scale's 256
// colours; a gap, or a diameter beyond the bins, is left transparent. Checked pixel by pixel against that rule,
// worked out here directly for each pixel (a linear search for the row and the bin, no shared code).
import { describe, expect, it } from 'vitest'
import type uPlot from 'uplot'
import type { CampaignRecord } from '../../src-core/index.ts'
import { COLOUR_TABLE, colourRange, drawColourMap, shadeLookup, shadeRun } from '../../src-renderer/campaign/colourMap.ts'

const BINS = 12
const EDGES = Float64Array.from({ length: BINS + 1 }, (_, i) => 0.01 * 10 ** (i / 6)) // 0.01–1 µm
const STEP = 300_000

/** rows of 5 minutes with a late row (its step cut short by the next) and a gap row; dN/dlogD with zeros. */
function record(rows: number): CampaignRecord {
  const times = new Float64Array(rows)
  const present = new Uint8Array(rows).fill(1)
  const dNdlogD = new Float64Array(rows * BINS)
  for (let i = 0; i < rows; i++) {
    times[i] = 1_700_000_000_000 + i * STEP + (i > rows / 2 ? 3 * STEP : 0) // a hole of three steps halfway
    for (let b = 0; b < BINS; b++) dNdlogD[i * BINS + b] = b === 3 ? 0 : 10 ** (1 + 4 * Math.abs(Math.sin(i / 7 + b / 3)))
  }
  present[5] = 0
  for (let b = 0; b < BINS; b++) dNdlogD[5 * BINS + b] = 0
  return { times, present, dNdlogD, bins: BINS, edgesUm: EDGES, intervalMs: STEP } as unknown as CampaignRecord
}

/** A plot area of w × h device pixels over [x0, x1] s and the bins' diameters (log), at a pixel ratio. */
function plot(w: number, h: number, x0: number, x1: number, ratio: number, yLo = EDGES[0], yHi = EDGES[BINS] * 1.3) {
  let put: { data: Uint8ClampedArray; width: number; height: number } | null = null
  const u = {
    bbox: { left: 10, top: 4, width: w, height: h },
    over: { clientWidth: w / ratio },
    posToVal: (pos: number, axis: 'x' | 'y') =>
      axis === 'x' ? x0 + (pos * ratio * (x1 - x0)) / w : 10 ** (Math.log10(yHi) - (pos * ratio * (Math.log10(yHi) - Math.log10(yLo))) / h),
    ctx: {
      createImageData: (cw: number, ch: number) => ({ width: cw, height: ch, data: new Uint8ClampedArray(cw * ch * 4) }),
      putImageData: (img: typeof put) => (put = img)
    }
  }
  return { u: u as unknown as uPlot, image: () => put! }
}

/** The colour (RGBA) of the pixel at (x, y) by the rule, worked out alone. */
function expected(r: CampaignRecord, u: uPlot, ratio: number, x: number, y: number, range: [number, number]): number[] {
  const t = u.posToVal(x / ratio, 'x') * 1000
  let row = -1
  for (let i = 0; i < r.times.length; i++) {
    const end = Math.min(r.times[i] + r.intervalMs, i + 1 < r.times.length ? r.times[i + 1] : Infinity)
    if (r.times[i] <= t && t < end) row = i
  }
  if (row < 0 || !r.present[row]) return [0, 0, 0, 0]
  const d = u.posToVal(y / ratio, 'y')
  let bin = -1
  for (let b = 0; b < r.bins; b++) if (r.edgesUm[b] <= d && d < r.edgesUm[b + 1]) bin = b
  if (bin < 0) return [0, 0, 0, 0]
  const v = r.dNdlogD[row * r.bins + bin]
  const k = v > 0 ? Math.max(0, Math.min(255, Math.round(((Math.log10(v) - range[0]) * 255) / (range[1] - range[0])))) : 0
  return [COLOUR_TABLE[k * 3], COLOUR_TABLE[k * 3 + 1], COLOUR_TABLE[k * 3 + 2], 255]
}

describe('the record colour map', () => {
  for (const [name, rows, w, h, ratio, from, to] of [
    ['more pixel columns than rows (columns repeat a row)', 40, 300, 60, 1, 0, 46],
    ['more rows than columns', 400, 90, 50, 1, 0, 403],
    ['a zoomed part at a pixel ratio of 2, the record starting inside it', 40, 240, 64, 2, -3, 20]
  ] as const) {
    it(`colours every pixel by its row and bin: ${name}`, () => {
      const r = record(rows)
      const x0 = r.times[0] / 1000 + from * 300
      const x1 = r.times[0] / 1000 + to * 300
      const { u, image } = plot(w, h, x0, x1, ratio)
      const range: [number, number] = [1.5, 4.5]
      // drawn first on another scale (its colours must not be kept for this one), then twice (the second from the
      // colours kept for the rows already drawn)
      drawColourMap(plot(w, h, x0, x1, ratio).u, r, [0, 3])
      drawColourMap(u, r, range)
      drawColourMap(u, r, range)
      const img = image()
      expect([img.width, img.height]).toEqual([w, h])
      let coloured = 0
      for (let y = 0; y < h; y++)
        for (let x = 0; x < w; x++) {
          const o = (y * w + x) * 4
          const got = [img.data[o], img.data[o + 1], img.data[o + 2], img.data[o + 3]]
          const want = expected(r, u, ratio, x, y, range)
          if (got.join() !== want.join()) expect({ x, y, got }).toEqual({ x, y, got: want })
          if (want[3]) coloured++
        }
      expect(coloured).toBeGreaterThan((w * h) / 3) // the check saw coloured pixels, not only transparent ones
    })
  }
})

describe('the colour scale’s ends', () => {
  it('are those the code before found (the sampled values sorted as numbers by a comparison)', () => {
    const before = (r: CampaignRecord): [number, number] => {
      const v: number[] = []
      const step = Math.max(1, Math.floor(r.dNdlogD.length / 200_000))
      for (let i = 0; i < r.dNdlogD.length; i += step) if (r.dNdlogD[i] > 0) v.push(Math.log10(r.dNdlogD[i]))
      if (v.length === 0) return [0, 1]
      v.sort((a, b) => a - b)
      const hi = v[Math.floor(0.995 * (v.length - 1))]
      const lo = Math.max(v[Math.floor(0.01 * (v.length - 1))], hi - 5)
      return hi > lo ? [Math.floor(lo * 2) / 2, Math.ceil(hi * 2) / 2] : [lo - 1, lo + 1]
    }
    for (const rows of [1, 40, 3000, 40_000]) {
      const r = record(rows)
      // some cells empty, negative or missing, as a record's may be
      for (let i = 0; i < r.dNdlogD.length; i += 11) r.dNdlogD[i] = i % 3 === 0 ? NaN : i % 3 === 1 ? -5 : 1
      expect(colourRange(r)).toEqual(before(r))
    }
    expect(colourRange(record(0))).toEqual([0, 1])
  })
})

describe('a cell’s shade without a logarithm per value (shadeLookup, shadeRun)', () => {
  // the rule: round((log₁₀ v − a) × scale) held to 0–255, 0 for a value that is not positive (written out here)
  const rule = (v: number, a: number, scale: number) => (v > 0 ? Math.max(0, Math.min(255, Math.round((Math.log10(v) - a) * scale))) : 0)
  const f = new Float64Array(1)
  const bits = new BigUint64Array(f.buffer)
  /** The double `steps` representable numbers away from x (x positive). */
  const nextTo = (x: number, steps: bigint) => ((f[0] = x), (bits[0] += steps), f[0])
  const shadesOf = (v: Float64Array, a: number, scale: number) => {
    const out = new Uint8Array(v.length)
    shadeRun(v, new Uint32Array(v.buffer), 0, v.length, shadeLookup(a, scale), out, 0)
    return out
  }
  for (const [a, z] of [[1.5, 4.5], [-2, 3], [0, 0.5], [2.5, 7.5]] as const) {
    it(`gives the rule's shade to every value: scale ${a} to ${z}`, () => {
      const scale = 255 / (z - a)
      const lookup = shadeLookup(a, scale)
      // values spread over the scale and four decades either side, and the values that are not ordinary
      const v: number[] = [0, -0, -1, NaN, Infinity, -Infinity, Number.MIN_VALUE, Number.MAX_VALUE, 1e-300, 1e300]
      for (let i = 0; i < 20_000; i++) v.push(10 ** (a - 4 + ((z - a + 8) * i) / 20_000))
      // each colour's least value and the three doubles either side of it: where a shortcut would go wrong
      for (let k = 1; k < 256; k++) for (let d = -3n; d <= 3n; d++) v.push(nextTo(lookup.thresholds[k], d))
      const values = Float64Array.from(v)
      const got = shadesOf(values, a, scale)
      let wrong = 0
      for (let i = 0; i < values.length; i++) if (got[i] !== rule(values[i], a, scale)) wrong++
      expect(wrong).toBe(0)
      // each colour is met: the check saw the whole scale, not a few shades
      expect(new Set(got).size).toBe(256)
    })
  }
})
