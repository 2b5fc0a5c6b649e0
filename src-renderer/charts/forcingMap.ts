// Drawing a forcing map in a uPlot chart: the heat map under the axes' grid, zero lines and sample markers over it.
import type uPlot from 'uplot'
import type { ForcingMapData } from '../../src-core/index.ts'
import { drawGridHeat, insidePlot } from './heatGrid.ts'
import { forcingColour, type Theme } from './palette.ts'

/** Marker shapes, one per compared sample, so that markers stay apart when they fall on the same spot. */
export const MARKER_SHAPES = ['circle', 'square', 'triangle', 'diamond', 'down', 'cross'] as const
export type MarkerShape = (typeof MARKER_SHAPES)[number]
/** The shapes in words and as characters, for legends. */
export const MARKER_SIGNS: Record<MarkerShape, string> = { circle: '●', square: '■', triangle: '▲', diamond: '◆', down: '▼', cross: '✚' }

export interface MapOverlay {
  zero: [number, number][]
  /** The sample's net zero line (sunlight + its infrared part), drawn dotted in its colour. */
  net?: [number, number][]
  sample: [number, number]
  stroke: string
  dash: number[]
  shape: MarkerShape
}

/** The largest |forcing| of a map, W m⁻²: the end of its colour scale (0 where the map is empty). */
export function mapScaleMax(map: ForcingMapData): number {
  let max = 0
  for (const row of map.forcing) for (const v of row) if (Number.isFinite(v)) max = Math.max(max, Math.abs(v))
  return max
}

/** The forcing map as a heat map, coloured by forcing relative to its largest magnitude. */
export function drawHeat(map: ForcingMapData, theme: Theme): (u: uPlot) => void {
  const max = mapScaleMax(map)
  // forcing[i][j] sits at (surface albedo j, ω i): the grid wants z[x][y]
  const z = map.surface_albedo.map((_, j) => map.ssa.map((_, i) => map.forcing[i][j]))
  return drawGridHeat(map.surface_albedo, map.ssa, z, (v) => forcingColour(max ? v / max : 0, theme), false)
}

function shapePath(ctx: CanvasRenderingContext2D, shape: MarkerShape, X: number, Y: number, r: number): void {
  ctx.beginPath()
  if (shape === 'circle') ctx.arc(X, Y, r, 0, 2 * Math.PI)
  else if (shape === 'square') ctx.rect(X - r * 0.85, Y - r * 0.85, 1.7 * r, 1.7 * r)
  else if (shape === 'triangle' || shape === 'down') {
    const s = shape === 'triangle' ? 1 : -1
    ctx.moveTo(X, Y - s * r * 1.1)
    ctx.lineTo(X + r, Y + s * r * 0.75)
    ctx.lineTo(X - r, Y + s * r * 0.75)
    ctx.closePath()
  } else if (shape === 'diamond') {
    ctx.moveTo(X, Y - r * 1.15)
    ctx.lineTo(X + r, Y)
    ctx.lineTo(X, Y + r * 1.15)
    ctx.lineTo(X - r, Y)
    ctx.closePath()
  } else {
    const a = r * 0.35
    ctx.moveTo(X - a, Y - r)
    ctx.lineTo(X + a, Y - r)
    ctx.lineTo(X + a, Y - a)
    ctx.lineTo(X + r, Y - a)
    ctx.lineTo(X + r, Y + a)
    ctx.lineTo(X + a, Y + a)
    ctx.lineTo(X + a, Y + r)
    ctx.lineTo(X - a, Y + r)
    ctx.lineTo(X - a, Y + a)
    ctx.lineTo(X - r, Y + a)
    ctx.lineTo(X - r, Y - a)
    ctx.lineTo(X - a, Y - a)
    ctx.closePath()
  }
}

/**
 * Each sample's zero line (clipped to the plot) and its marker (not clipped: a sample at ω = 1 or Rs = 0 sits on
 * the plot's edge and stays whole). Markers have their own shapes and shrink one step per sample, drawn largest
 * first with a halo, so markers on the same spot show as nested shapes.
 */
export function drawOverlays(overlays: MapOverlay[], ink: string, halo: string): (u: uPlot) => void {
  return (u) => {
    insidePlot(u, (ctx, px) => {
      for (const o of overlays) {
        ctx.strokeStyle = halo
        ctx.lineWidth = 4.5 * px
        ctx.setLineDash([])
        ctx.beginPath()
        o.zero.forEach(([x, y], k) => {
          const X = u.valToPos(x, 'x', true)
          const Y = u.valToPos(y, 'y', true)
          if (k === 0) ctx.moveTo(X, Y)
          else ctx.lineTo(X, Y)
        })
        ctx.stroke()
        ctx.strokeStyle = o.stroke
        ctx.lineWidth = 2.5 * px
        ctx.setLineDash(o.dash.map((d) => d * px))
        ctx.stroke()
        if (o.net && o.net.length > 1) {
          ctx.beginPath()
          o.net.forEach(([x, y], k) => {
            const X = u.valToPos(x, 'x', true)
            const Y = u.valToPos(y, 'y', true)
            if (k === 0) ctx.moveTo(X, Y)
            else ctx.lineTo(X, Y)
          })
          ctx.strokeStyle = halo
          ctx.lineWidth = 4 * px
          ctx.setLineDash([])
          ctx.stroke()
          ctx.strokeStyle = o.stroke
          ctx.lineWidth = 2 * px
          ctx.setLineDash([2 * px, 3 * px])
          ctx.stroke()
        }
      }
    })
    const ctx = u.ctx
    ctx.save()
    ctx.setLineDash([])
    const px = devicePixelRatio
    overlays.forEach((o, k) => {
      const X = u.valToPos(o.sample[0], 'x', true)
      const Y = u.valToPos(o.sample[1], 'y', true)
      const r = Math.max(3.5, 8 - 1.5 * k) * px
      shapePath(ctx, o.shape, X, Y, r)
      ctx.strokeStyle = halo
      ctx.lineWidth = 4 * px
      ctx.stroke()
      ctx.fillStyle = o.stroke
      ctx.fill()
      ctx.strokeStyle = ink
      ctx.lineWidth = 1.5 * px
      ctx.stroke()
    })
    ctx.restore()
  }
}

/** Values for the map's numeric colour scale, W m⁻²: −max … 0 … +max in `steps` equal parts either side. */
export function scaleTicks(max: number, steps = 2): number[] {
  if (!(max > 0)) return [0]
  const out: number[] = []
  for (let k = -steps; k <= steps; k++) out.push((k / steps) * max)
  return out
}

/** A CSS gradient of the map's colours from −max (left) to +max (right). */
export function scaleGradient(theme: Theme, stops = 24): string {
  const cols: string[] = []
  for (let k = 0; k <= stops; k++) cols.push(forcingColour(-1 + (2 * k) / stops, theme))
  return `linear-gradient(to right, ${cols.join(', ')})`
}
