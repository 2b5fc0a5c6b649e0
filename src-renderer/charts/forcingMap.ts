// Drawing a forcing map in a uPlot chart: the heat map under the axes' grid, zero lines and sample markers over it.
import type uPlot from 'uplot'
import type { ForcingMapData } from '../../src-core/index.ts'
import { drawGridHeat, insidePlot } from './heatGrid.ts'
import { forcingColour, type Theme } from './palette.ts'

export interface MapOverlay {
  zero: [number, number][]
  sample: [number, number]
  stroke: string
  dash: number[]
}

/** The forcing map as a heat map, coloured by forcing relative to its largest magnitude. */
export function drawHeat(map: ForcingMapData, theme: Theme): (u: uPlot) => void {
  let max = 0
  for (const row of map.forcing) for (const v of row) if (Number.isFinite(v)) max = Math.max(max, Math.abs(v))
  // forcing[i][j] sits at (surface albedo j, ω i): the grid wants z[x][y]
  const z = map.surface_albedo.map((_, j) => map.ssa.map((_, i) => map.forcing[i][j]))
  return drawGridHeat(map.surface_albedo, map.ssa, z, (v) => forcingColour(max ? v / max : 0, theme), false)
}

export function drawOverlays(overlays: MapOverlay[], ink: string): (u: uPlot) => void {
  return (u) => insidePlot(u, (ctx, px) => {
    for (const o of overlays) {
      ctx.strokeStyle = o.stroke
      ctx.lineWidth = 2.5 * px
      ctx.setLineDash(o.dash.map((d) => d * px))
      ctx.beginPath()
      o.zero.forEach(([x, y], k) => {
        const X = u.valToPos(x, 'x', true)
        const Y = u.valToPos(y, 'y', true)
        if (k === 0) ctx.moveTo(X, Y)
        else ctx.lineTo(X, Y)
      })
      ctx.stroke()
    }
    ctx.setLineDash([])
    for (const o of overlays) {
      const X = u.valToPos(o.sample[0], 'x', true)
      const Y = u.valToPos(o.sample[1], 'y', true)
      ctx.fillStyle = o.stroke
      ctx.strokeStyle = ink
      ctx.lineWidth = 1.5 * px
      ctx.beginPath()
      ctx.arc(X, Y, 6 * px, 0, 2 * Math.PI)
      ctx.fill()
      ctx.stroke()
    }
  })
}
