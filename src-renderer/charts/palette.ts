/**
 * Line colours and dashes for samples and quantities. The hues are the colour-blind-safe set proposed by
 * Okabe & Ito (2008), darkened or lightened per theme for contrast; every line also has its own dash, so
 * lines stay apart in grey print and for any colour vision. On the light panel the set's black stands in for its
 * orange: darkened enough for contrast on white, that orange could not be told from the vermilion in simulated
 * deuteranopia (ΔE*ab 3.3). test/renderer/palette.test.ts checks contrast and separation for each theme.
 */
export type Theme = 'light' | 'dark'

const HUES: Record<Theme, string[]> = {
  light: ['#0060a0', '#c24e00', '#007a5a', '#a8447f', '#2b2b2b', '#3b8fc4'],
  dark: ['#56b4e9', '#ef7a2e', '#2ec496', '#e08fc0', '#f0c030', '#9fd3f5']
}

const DASHES: number[][] = [[], [9, 4], [2, 3], [12, 3, 2, 3], [5, 5], [1, 2]]

export interface LineStyle {
  stroke: string
  dash: number[]
  /** Words for the dash, so a legend can say which line is which without colour. */
  dashName: string
}

const DASH_NAMES = ['solid', 'dashed', 'dotted', 'dash-dot', 'long dash', 'fine dots']

export function lineStyle(i: number, theme: Theme): LineStyle {
  const k = i % HUES.light.length
  return { stroke: HUES[theme][k], dash: DASHES[k], dashName: DASH_NAMES[k] }
}

/**
 * Diverging colours for forcing maps: blue for cooling (negative), orange-brown for warming (positive), pale at
 * zero (a scheme that colour-blind readers can tell apart). `t` is the forcing divided by the largest |forcing|.
 */
export function forcingColour(t: number, theme: Theme): string {
  const c = Math.max(-1, Math.min(1, t))
  const mid = theme === 'light' ? [247, 247, 247] : [44, 48, 54]
  const cool = theme === 'light' ? [33, 102, 172] : [67, 147, 230]
  const warm = theme === 'light' ? [179, 88, 6] : [235, 130, 40]
  const end = c < 0 ? cool : warm
  const f = Math.pow(Math.abs(c), 0.6)
  const rgb = mid.map((m, i) => Math.round(m + (end[i] - m) * f))
  return `rgb(${rgb[0]},${rgb[1]},${rgb[2]})`
}
