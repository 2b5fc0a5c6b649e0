// Colours of the workbench (src-renderer/charts/palette.ts and the theme variables in src-renderer/styles.css):
// readable text in both themes, chart lines that stand out from the panel, and compared samples whose lines stay
// apart for readers with a red, green or blue colour-vision deficiency.
//
// The checker below is written here from the published definitions, not taken from the app:
// - sRGB decoding and the linear-RGB → XYZ (D65) matrix: IEC 61966-2-1:1999 (from memory);
// - CIELAB and the colour difference ΔE*ab (CIE76): CIE 15:2004, Colorimetry (from memory);
// - relative luminance and contrast ratio, and the thresholds 4.5:1 (text, SC 1.4.3), 7:1 (text, SC 1.4.6) and
//   3:1 (graphical objects, SC 1.4.11): W3C, Web Content Accessibility Guidelines 2.1 (2018);
// - simulation of protanopia, deuteranopia and tritanopia in linear RGB, severity 1: Machado, Oliveira &
//   Fernandes (2009), IEEE Trans. Visualization and Computer Graphics 15(6), 1291–1298, Table 1 (from memory).
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { forcingColour, lineStyle, type Theme } from '../../src-renderer/charts/palette.ts'

type RGB = [number, number, number]

const SIMULATIONS: Record<string, number[][]> = {
  'normal vision': [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1]
  ],
  protanopia: [
    [0.152286, 1.052583, -0.204868],
    [0.114503, 0.786281, 0.099216],
    [-0.003882, -0.048116, 1.051998]
  ],
  deuteranopia: [
    [0.367322, 0.860646, -0.227968],
    [0.280085, 0.672501, 0.047413],
    [-0.01182, 0.04294, 0.968881]
  ],
  tritanopia: [
    [1.255528, -0.076749, -0.178779],
    [-0.078411, 0.930809, 0.147602],
    [0.004733, 0.691367, 0.3039]
  ]
}

function parseColour(c: string): RGB {
  const rgb = /^rgb\((\d+),\s*(\d+),\s*(\d+)\)$/.exec(c)
  if (rgb) return [Number(rgb[1]), Number(rgb[2]), Number(rgb[3])]
  const hex = /^#([0-9a-f]{6})$/i.exec(c)
  if (!hex) throw new Error(`not a colour: ${c}`)
  return [0, 2, 4].map((i) => parseInt(hex[1].slice(i, i + 2), 16)) as RGB
}

const decode = (v: number): number => {
  const c = v / 255
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4
}
const linear = (c: string): RGB => parseColour(c).map(decode) as RGB

function labOfLinear([r, g, b]: RGB): RGB {
  const x = 0.4124 * r + 0.3576 * g + 0.1805 * b
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b
  const z = 0.0193 * r + 0.1192 * g + 0.9505 * b
  const f = (t: number) => (t > (6 / 29) ** 3 ? Math.cbrt(t) : t / (3 * (6 / 29) ** 2) + 4 / 29)
  const [fx, fy, fz] = [f(x / 0.95047), f(y), f(z / 1.08883)]
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)]
}

const seenAs = (c: string, m: number[][]): RGB => {
  const l = linear(c)
  return m.map((row) => Math.min(1, Math.max(0, row[0] * l[0] + row[1] * l[1] + row[2] * l[2]))) as RGB
}
const deltaE = (a: RGB, b: RGB) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2])
const differenceSeen = (c1: string, c2: string, m: number[][]) => deltaE(labOfLinear(seenAs(c1, m)), labOfLinear(seenAs(c2, m)))

const luminance = (c: string) => {
  const [r, g, b] = linear(c)
  return 0.2126 * r + 0.7152 * g + 0.0722 * b
}
const contrast = (a: string, b: string) => {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x)
  return (hi + 0.05) / (lo + 0.05)
}

/** The theme variables as styles.css sets them (the first block is the light theme, the second the dark). */
function themeColours(): Record<Theme, Record<string, string>> {
  const css = readFileSync(join(import.meta.dirname, '../../src-renderer/styles.css'), 'utf8')
  const blocks = [...css.matchAll(/\{([^{}]*--panel:[^{}]*)\}/g)].map((m) => m[1])
  const vars = (block: string) => Object.fromEntries([...block.matchAll(/--([\w-]+):\s*(#[0-9a-fA-F]{6})/g)].map((m) => [m[1], m[2]]))
  return { light: vars(blocks[0]), dark: vars(blocks[1]) }
}

describe('the colour checker itself', () => {
  it('gives the tabulated CIELAB of sRGB red and white (IEC 61966-2-1 with CIE 15; from memory: 53.24, 80.09, 67.20)', () => {
    const red = labOfLinear(linear('#ff0000'))
    expect(red[0]).toBeCloseTo(53.24, 1)
    expect(red[1]).toBeCloseTo(80.09, 0)
    expect(red[2]).toBeCloseTo(67.2, 0)
    const white = labOfLinear(linear('#ffffff'))
    expect(white[0]).toBeCloseTo(100, 2)
    expect(Math.hypot(white[1], white[2])).toBeLessThan(0.05) // the matrix has four decimals
  })

  it('gives 21:1 for black on white and 1:1 for a colour on itself (WCAG 2.1 contrast ratio)', () => {
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 6)
    expect(contrast('#0060a0', '#0060a0')).toBe(1)
  })

  it('keeps greys grey in every simulated vision (each row of the Machado et al. 2009 matrices sums to 1)', () => {
    for (const m of Object.values(SIMULATIONS)) for (const row of m) expect(row[0] + row[1] + row[2]).toBeCloseTo(1, 5)
  })

  it('shows the confusion it should: pure red and green come much closer in simulated deuteranopia', () => {
    const normal = differenceSeen('#ff0000', '#00ff00', SIMULATIONS['normal vision'])
    const deutan = differenceSeen('#ff0000', '#00ff00', SIMULATIONS['deuteranopia'])
    expect(deutan).toBeLessThan(normal / 3)
  })
})

describe.each(['light', 'dark'] as const)('the %s theme', (theme) => {
  const v = themeColours()[theme]

  it('has text of at least 7:1 on the panels and the page, secondary text of at least 4.5:1 (WCAG 2.1 SC 1.4.6 and 1.4.3)', () => {
    for (const bg of [v['panel'], v['panel-2'], v['bg']]) {
      expect(contrast(v['ink'], bg)).toBeGreaterThanOrEqual(7)
      expect(contrast(v['muted'], bg)).toBeGreaterThanOrEqual(4.5)
    }
  })

  it('writes the verdicts, warnings and errors at 4.5:1 or more on their own backgrounds (WCAG 2.1 SC 1.4.3)', () => {
    const pairs: [string, string][] = [
      ['cool', 'cool-bg'],
      ['warm', 'warm-bg'],
      ['bad', 'bad-bg'],
      ['warn-ink', 'warn-bg'],
      ['accent-ink', 'accent'],
      ['ok', 'panel'],
      ['accent', 'panel']
    ]
    for (const [fg, bg] of pairs) expect(contrast(v[fg], v[bg]), `${fg} on ${bg}`).toBeGreaterThanOrEqual(4.5)
  })

  it('draws every compared sample’s line at 3:1 or more against the chart panel (WCAG 2.1 SC 1.4.11)', () => {
    for (let i = 0; i < 6; i++) expect(contrast(lineStyle(i, theme).stroke, v['panel']), `line ${i}`).toBeGreaterThanOrEqual(3)
  })

  it('keeps the six comparison lines apart in colour (ΔE*ab ≥ 10) for normal vision and each simulated deficiency, and gives each its own dash', () => {
    // ΔE*ab of about 2.3 is just noticeable side by side (common practice); thin lines across a chart need far more.
    for (const [name, m] of Object.entries(SIMULATIONS)) {
      for (let i = 0; i < 6; i++) {
        for (let j = i + 1; j < 6; j++) {
          const d = differenceSeen(lineStyle(i, theme).stroke, lineStyle(j, theme).stroke, m)
          expect(d, `${name}: lines ${i} and ${j}`).toBeGreaterThanOrEqual(10)
        }
      }
    }
    const dashes = new Set(Array.from({ length: 6 }, (_, i) => lineStyle(i, theme).dash.join(',')))
    expect(dashes.size).toBe(6)
  })

  it('colours the forcing map so that cooling and warming stay apart in every simulated vision, pale to strong from zero', () => {
    for (const [name, m] of Object.entries(SIMULATIONS)) {
      for (const t of [0.2, 0.5, 1]) {
        expect(differenceSeen(forcingColour(-t, theme), forcingColour(t, theme), m), `${name}, |t| = ${t}`).toBeGreaterThanOrEqual(20)
      }
    }
    // the lightness moves away from the zero colour's steadily on both sides, so the zero line reads as the palest
    // (light theme) or darkest (dark theme) band
    const lightness = (t: number) => labOfLinear(linear(forcingColour(t, theme)))[0]
    for (const sign of [-1, 1]) {
      const steps = [0, 0.25, 0.5, 0.75, 1].map((t) => Math.abs(lightness(sign * t) - lightness(0)))
      for (let k = 1; k < steps.length; k++) expect(steps[k]).toBeGreaterThan(steps[k - 1])
    }
  })
})
