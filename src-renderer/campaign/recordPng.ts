// The record's charts as one PNG (the stack's plots as RecordCharts.tsx shows them).
import type uPlot from 'uplot'
import { colourCss } from './colourMap.ts'
import { cssVar } from './panels.ts'

/** The plots of the stack, for the PNG export (`settle` draws any chart still drawn as during a gesture). */
export const shownPlots: { plots: uPlot[]; titles: string[]; settle: () => void } = { plots: [], titles: [], settle: () => {} }

/** Every chart of the stack in one PNG (titles, plots and the colour scale), theme background. */
export function recordPng(): string | null {
  const plots = shownPlots.plots
  if (plots.length === 0) return null
  shownPlots.settle()
  const ratio = plots[0].ctx.canvas.width / plots[0].width
  const w = plots[0].ctx.canvas.width
  const titleH = 24 * ratio
  const h = plots.reduce((s, u) => s + u.ctx.canvas.height + titleH, 0) + 30 * ratio
  const out = document.createElement('canvas')
  out.width = w
  out.height = h
  const ctx = out.getContext('2d') as CanvasRenderingContext2D
  const el = plots[0].root
  ctx.fillStyle = cssVar('--panel', el)
  ctx.fillRect(0, 0, w, h)
  let y = 0
  plots.forEach((u, i) => {
    ctx.fillStyle = cssVar('--ink', el)
    ctx.font = `600 ${13 * ratio}px system-ui, "DejaVu Sans", sans-serif`
    ctx.fillText(shownPlots.titles[i] ?? '', 8 * ratio, y + 17 * ratio)
    y += titleH
    ctx.drawImage(u.ctx.canvas, 0, y)
    y += u.ctx.canvas.height
  })
  // the colour scale under the stack
  for (let x = 0; x < 200 * ratio; x++) {
    ctx.fillStyle = colourCss(x / (200 * ratio))
    ctx.fillRect(8 * ratio + x, y + 8 * ratio, 1, 12 * ratio)
  }
  ctx.fillStyle = cssVar('--ink', el)
  ctx.font = `${12 * ratio}px system-ui, "DejaVu Sans", sans-serif`
  ctx.fillText('dN/dlogD (cm⁻³), log scale, low → high (see the legend in the app)', 216 * ratio, y + 19 * ratio)
  return out.toDataURL('image/png')
}
