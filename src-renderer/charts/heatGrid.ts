// Drawing on uPlot charts for the tool views: a heat map of values on a grid (like the forcing map, under the
// axes' grid), point markers over it, and vertical reference lines.
import type uPlot from 'uplot'
import type { Theme } from './palette.ts'

/**
 * A sequential ramp readable with any colour vision and in grey print: the viridis colour map's end points and
 * midpoints (van der Walt & Smith 2015), interpolated linearly in RGB. t = 0 is dark purple, 1 is yellow.
 */
const RAMP: [number, number, number][] = [
  [68, 1, 84],
  [65, 68, 135],
  [42, 120, 142],
  [34, 168, 132],
  [122, 209, 81],
  [253, 231, 37]
]

export function rampColour(t: number): string {
  const c = Math.max(0, Math.min(1, Number.isFinite(t) ? t : 1)) * (RAMP.length - 1)
  const i = Math.min(RAMP.length - 2, Math.floor(c))
  const f = c - i
  const rgb = RAMP[i].map((a, k) => Math.round(a + (RAMP[i + 1][k] - a) * f))
  return `rgb(${rgb[0]},${rgb[1]},${rgb[2]})`
}

/** Cell edges around grid values: midpoints (geometric for a log axis), the outer edges at the end values. */
function cellEdges(a: number[], log: boolean): [number, number][] {
  const mid = (p: number, q: number) => (log ? Math.sqrt(p * q) : (p + q) / 2)
  return a.map((v, k) => [k === 0 ? v : mid(a[k - 1], v), k === a.length - 1 ? v : mid(v, a[k + 1])])
}

/** Heat map of z[i][j] at (x[i], y[j]), each cell coloured by `colour`. */
export function drawGridHeat(x: number[], y: number[], z: number[][], colour: (v: number) => string, logY: boolean): (u: uPlot) => void {
  const xe = cellEdges(x, false)
  const ye = cellEdges(y, logY)
  return (u) => {
    const ctx = u.ctx
    ctx.save()
    for (let i = 0; i < x.length; i++) {
      const x0 = u.valToPos(xe[i][0], 'x', true)
      const x1 = u.valToPos(xe[i][1], 'x', true)
      for (let j = 0; j < y.length; j++) {
        const y0 = u.valToPos(ye[j][0], 'y', true)
        const y1 = u.valToPos(ye[j][1], 'y', true)
        ctx.fillStyle = colour(z[i][j])
        ctx.fillRect(Math.floor(x0), Math.floor(y1), Math.ceil(x1 - x0) + 1, Math.ceil(y0 - y1) + 1)
      }
    }
    ctx.restore()
  }
}

export interface Marker {
  x: number
  y: number
  shape: 'circle' | 'diamond'
}

/** Runs `draw` on the chart's canvas clipped to the plot area (its state saved and restored around it). */
export function insidePlot(u: uPlot, draw: (ctx: CanvasRenderingContext2D, px: number) => void): void {
  const ctx = u.ctx
  ctx.save()
  ctx.beginPath()
  ctx.rect(u.bbox.left, u.bbox.top, u.bbox.width, u.bbox.height)
  ctx.clip()
  draw(ctx, devicePixelRatio)
  ctx.restore()
}

/** Markers drawn twice (a light halo, then dark), so that they show on any colour of the map. */
export function drawMarkers(markers: Marker[]): (u: uPlot) => void {
  return (u) => insidePlot(u, (ctx, px) => {
    for (const m of markers) {
      const X = u.valToPos(m.x, 'x', true)
      const Y = u.valToPos(m.y, 'y', true)
      const r = (m.shape === 'circle' ? 6 : 7) * px
      const path = () => {
        ctx.beginPath()
        if (m.shape === 'circle') ctx.arc(X, Y, r, 0, 2 * Math.PI)
        else {
          ctx.moveTo(X, Y - r)
          ctx.lineTo(X + r, Y)
          ctx.lineTo(X, Y + r)
          ctx.lineTo(X - r, Y)
          ctx.closePath()
        }
      }
      path()
      ctx.strokeStyle = '#ffffff'
      ctx.lineWidth = 4 * px
      ctx.stroke()
      path()
      ctx.strokeStyle = '#000000'
      ctx.lineWidth = 2 * px
      ctx.stroke()
      if (m.shape === 'circle') {
        ctx.fillStyle = '#ffffff'
        ctx.fill()
      }
    }
  })
}

/** A vertical line at x (e.g. zero forcing), with short words on either side of it at the top. */
export function drawVertical(x: number, stroke: string, theme: Theme, left?: string, right?: string): (u: uPlot) => void {
  return (u) => {
    const ctx = u.ctx
    const px = devicePixelRatio
    const X = u.valToPos(x, 'x', true)
    if (X < u.bbox.left - 1 || X > u.bbox.left + u.bbox.width + 1) return
    ctx.save()
    ctx.strokeStyle = stroke
    ctx.lineWidth = 2 * px
    ctx.setLineDash([6 * px, 4 * px])
    ctx.beginPath()
    ctx.moveTo(X, u.bbox.top)
    ctx.lineTo(X, u.bbox.top + u.bbox.height)
    ctx.stroke()
    ctx.setLineDash([])
    ctx.fillStyle = theme === 'light' ? '#14171a' : '#eef1f4'
    ctx.font = `${12 * px}px system-ui, "DejaVu Sans", sans-serif`
    ctx.textBaseline = 'top'
    if (left) {
      const room = X - u.bbox.left - 6 * px
      const w = ctx.measureText(left).width
      ctx.textAlign = room >= w ? 'right' : 'left'
      ctx.fillText(left, room >= w ? X - 6 * px : u.bbox.left + 2 * px, u.bbox.top + (room >= w ? 4 : 20) * px)
    }
    if (right) {
      // Beside the line when there is room, else against the right edge one line lower.
      const room = u.bbox.left + u.bbox.width - X - 6 * px
      const w = ctx.measureText(right).width
      ctx.textAlign = room >= w ? 'left' : 'right'
      ctx.fillText(right, room >= w ? X + 6 * px : u.bbox.left + u.bbox.width - 2 * px, u.bbox.top + (room >= w ? 4 : 20) * px)
    }
    ctx.restore()
  }
}
