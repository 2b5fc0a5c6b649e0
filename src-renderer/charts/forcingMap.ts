// Drawing a forcing map in a uPlot chart: the heat map under the axes' grid, zero lines and sample markers over it.
import type uPlot from 'uplot'
import type { ForcingMapData } from '../../src-core/index.ts'
import { forcingColour, type Theme } from './palette.ts'

export interface MapOverlay {
  zero: [number, number][]
  sample: [number, number]
  stroke: string
  dash: number[]
}

export function drawHeat(map: ForcingMapData, theme: Theme): (u: uPlot) => void {
  let max = 0
  for (const row of map.forcing) for (const v of row) if (Number.isFinite(v)) max = Math.max(max, Math.abs(v))
  const edges = (a: number[]) => a.map((v, k) => [k === 0 ? v : (a[k - 1] + v) / 2, k === a.length - 1 ? v : (v + a[k + 1]) / 2])
  const xe = edges(map.surface_albedo)
  const ye = edges(map.ssa)
  return (u) => {
    const ctx = u.ctx
    ctx.save()
    for (let i = 0; i < map.ssa.length; i++) {
      const y0 = u.valToPos(ye[i][0], 'y', true)
      const y1 = u.valToPos(ye[i][1], 'y', true)
      for (let j = 0; j < map.surface_albedo.length; j++) {
        const x0 = u.valToPos(xe[j][0], 'x', true)
        const x1 = u.valToPos(xe[j][1], 'x', true)
        ctx.fillStyle = forcingColour(max ? map.forcing[i][j] / max : 0, theme)
        ctx.fillRect(Math.floor(x0), Math.floor(y1), Math.ceil(x1 - x0) + 1, Math.ceil(y0 - y1) + 1)
      }
    }
    ctx.restore()
  }
}

export function drawOverlays(overlays: MapOverlay[], ink: string): (u: uPlot) => void {
  return (u) => {
    const ctx = u.ctx
    const px = devicePixelRatio
    ctx.save()
    ctx.beginPath()
    ctx.rect(u.bbox.left, u.bbox.top, u.bbox.width, u.bbox.height)
    ctx.clip()
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
    ctx.restore()
  }
}
