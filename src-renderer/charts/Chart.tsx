// A uPlot chart in a Preact component: sized to its box, built anew when its layout or theme changes and only
// redrawn when its data does, with a button that saves it as PNG (title, legend and theme background included).
import { render } from 'preact'
import { useEffect, useRef } from 'preact/hooks'
import uPlot from 'uplot'
import 'uplot/dist/uPlot.min.css'
import { host } from '../host/index.ts'
import { fileStem, minus } from '../format.ts'
import { CHART_FONT, themedAxis } from './axis.ts'
import { DashSwatch } from './DashSwatch.tsx'
import type { Theme } from './palette.ts'

export interface Line {
  label: string
  stroke: string
  dash?: number[]
  width?: number
  /** Draw as points only. */
  points?: boolean
  /** Draw as steps (measured bins). */
  steps?: boolean
  /** Which y axis (0 left, 1 right). */
  axis?: 0 | 1
  /** Draw as bars centred on the x values (histograms), filled with `fill`. */
  bars?: boolean
  fill?: string
}

export interface ChartProps {
  title: string
  /** x values, then one array per line (null = gap). */
  data: (number | null)[][]
  lines: Line[]
  xLabel: string
  yLabel: string
  y2Label?: string
  xLog?: boolean
  yLog?: boolean
  xRange?: [number, number]
  /** Where the x axis has its tick labels (log wavelength axes). */
  xTicks?: number[]
  yRange?: [number, number]
  /** Where the y axis has its tick labels and grid lines (log axes). */
  yTicks?: number[]
  height?: number
  theme: Theme
  /** Extra drawing under the lines (heat maps) or over them (markers). */
  drawUnder?: (u: uPlot) => void
  drawOver?: (u: uPlot) => void
  stale?: boolean
  /** Test hook and PNG file name. */
  name: string
}

/** A theme colour as it applies where the chart sits (the report keeps the light theme). */
function cssVar(name: string, el: Element = document.documentElement): string {
  return getComputedStyle(el).getPropertyValue(name).trim() || '#000'
}

/** Short tick labels: 0.05, 550, 12k, 3e5. */
function tick(v: number | null): string {
  if (v === null || !Number.isFinite(v)) return ''
  const a = Math.abs(v)
  if (a === 0) return '0'
  if (a >= 1e5 || a < 1e-3) return minus(v.toExponential(0).replace('e+', 'e'))
  if (a >= 1e4) return minus(`${Number((v / 1000).toPrecision(3))}k`)
  return minus(String(Number(v.toPrecision(4))))
}


/** `current` gives the newest props: the drawing hooks draw what the chart shows now, not what it first showed. */
function options(p: ChartProps, width: number, el: Element, current: () => ChartProps = () => p): uPlot.Options {
  const ink = cssVar('--ink', el)
  const grid = cssVar('--grid', el)
  const axis = (label: string, side?: number, ticks?: number[]): uPlot.Axis => ({
    ...themedAxis(label, ink, grid, side),
    size: 50,
    gap: 3,
    values: (_u: uPlot, splits: number[]) => splits.map(tick),
    ...(ticks ? { splits: () => ticks, filter: (_u: uPlot, splits: number[]) => splits } : {})
  })
  const range = (r?: [number, number]) => (r ? { range: r } : {})
  const scales: uPlot.Scales = {
    x: { time: false, ...(p.xLog ? { distr: 3, log: 10 } : {}), ...range(p.xRange) },
    y: { ...(p.yLog ? { distr: 3, log: 10 } : {}), ...range(p.yRange) }
  }
  if (p.y2Label) scales['y2'] = {}
  return {
    width,
    height: p.height ?? 220,
    pxAlign: 0,
    scales,
    legend: { show: true, live: false },
    cursor: { drag: { x: false, y: false }, points: { show: false } },
    axes: [axis(p.xLabel, undefined, p.xTicks), axis(p.yLabel, undefined, p.yTicks), ...(p.y2Label ? [{ ...axis(p.y2Label, 1), scale: 'y2' }] : [])],
    series: [
      { label: p.xLabel },
      ...p.lines.map(
        (l): uPlot.Series => ({
          label: l.label,
          stroke: l.stroke,
          width: l.width ?? 2,
          dash: l.dash,
          scale: l.axis === 1 ? 'y2' : 'y',
          spanGaps: !!l.steps,
          ...(l.points ? { paths: () => null, points: { show: true, size: 9, stroke: l.stroke, fill: l.stroke } } : { points: { show: false } }),
          ...(l.steps ? { paths: uPlot.paths.stepped?.({ align: 1 }) } : {}),
          ...(l.bars ? { paths: uPlot.paths.bars?.({ size: [0.96, Infinity], align: 0 }), fill: l.fill ?? l.stroke, width: l.width ?? 1 } : {})
        })
      )
    ],
    hooks: {
      drawClear: p.drawUnder ? [(u) => current().drawUnder?.(u)] : [],
      draw: p.drawOver ? [(u) => current().drawOver?.(u)] : []
    }
  }
}

/**
 * uPlot marks each line in its legend with a small box in the line's colour; this draws the line's own dash there
 * instead, as the PNG legend and the sample list do, so the legend reads without telling colours apart.
 */
function legendDashes(root: HTMLElement, lines: Line[]): void {
  const markers = root.querySelectorAll<HTMLElement>('.u-legend .u-series .u-marker')
  const first = markers.length - lines.length // the x series' row, when uPlot lists it
  lines.forEach((l, i) => {
    const marker = markers[first + i]
    if (!marker || l.bars || l.points) return
    marker.style.border = 'none'
    marker.style.background = 'none'
    marker.classList.add('dash-mark')
    render(<DashSwatch stroke={l.stroke} dash={l.dash ?? []} />, marker)
  })
}

/** The chart's picture as PNG: theme background, title, plot and a legend written below. */
export function chartPng(u: uPlot, title: string, lines: Line[]): string {
  const src = u.ctx.canvas
  const ratio = src.width / u.width
  const legendRows = Math.ceil(lines.length / 3)
  const out = document.createElement('canvas')
  out.width = src.width
  out.height = src.height + (34 + legendRows * 20) * ratio
  const ctx = out.getContext('2d') as CanvasRenderingContext2D
  const el = u.root
  ctx.fillStyle = cssVar('--panel', el)
  ctx.fillRect(0, 0, out.width, out.height)
  ctx.scale(ratio, ratio)
  ctx.fillStyle = cssVar('--ink', el)
  ctx.font = `600 14px system-ui, "DejaVu Sans", sans-serif`
  ctx.fillText(title, 8, 20)
  ctx.setTransform(1, 0, 0, 1, 0, 0)
  ctx.drawImage(src, 0, 30 * ratio)
  ctx.scale(ratio, ratio)
  ctx.font = CHART_FONT
  lines.forEach((l, i) => {
    const x = 8 + (i % 3) * (u.width / 3)
    const y = src.height / ratio + 44 + Math.floor(i / 3) * 20
    ctx.strokeStyle = l.stroke
    ctx.lineWidth = 2
    ctx.setLineDash(l.dash ?? [])
    ctx.beginPath()
    ctx.moveTo(x, y - 4)
    ctx.lineTo(x + 26, y - 4)
    ctx.stroke()
    ctx.fillStyle = cssVar('--ink', el)
    ctx.fillText(l.label, x + 32, y)
  })
  return out.toDataURL('image/png')
}

/** What the chart plots, in words, for screen readers (the axes are drawn on the canvas). */
function axesInWords(p: ChartProps): string {
  const scale = (log?: boolean) => (log ? ' (log scale)' : '')
  const lines = p.lines.map((l) => l.label).join('; ')
  return `${p.yLabel}${scale(p.yLog)}${p.y2Label ? ` and ${p.y2Label}` : ''} against ${p.xLabel}${scale(p.xLog)}${lines ? `. Lines: ${lines}` : ''}.`
}

export function Chart(p: ChartProps) {
  const box = useRef<HTMLDivElement>(null)
  const plot = useRef<uPlot | null>(null)
  const props = useRef(p)
  props.current = p
  /** What the plot shows now: new data or drawing over an unchanged layout is a redraw, not a new plot. */
  const shown = useRef<Pick<ChartProps, 'data' | 'drawUnder' | 'drawOver'> | null>(null)
  // Everything that shapes the plot (its series, axes and scales) apart from the data it draws.
  const layout = JSON.stringify([p.lines, p.xLabel, p.yLabel, p.y2Label, p.xLog, p.yLog, p.xRange, p.yRange, p.xTicks, p.yTicks, p.height, !!p.drawUnder, !!p.drawOver])

  useEffect(() => {
    const el = box.current
    if (!el) return
    const width = Math.max(240, el.clientWidth)
    const now = props.current
    const u = new uPlot(options(now, width, el, () => props.current), now.data as uPlot.AlignedData, el)
    legendDashes(u.root, now.lines)
    plot.current = u
    shown.current = { data: now.data, drawUnder: now.drawUnder, drawOver: now.drawOver }
    const ro = new ResizeObserver(() => {
      const w = Math.max(240, el.clientWidth)
      if (Math.abs(w - u.width) > 2) u.setSize({ width: w, height: props.current.height ?? 220 })
    })
    ro.observe(el)
    return () => {
      ro.disconnect()
      u.destroy()
      plot.current = null
      shown.current = null
    }
  }, [layout, p.theme])

  useEffect(() => {
    const u = plot.current
    const was = shown.current
    if (!u || !was) return
    if (was.data !== p.data) u.setData(p.data as uPlot.AlignedData)
    else if (was.drawUnder !== p.drawUnder || was.drawOver !== p.drawOver) u.redraw(false)
    shown.current = { data: p.data, drawUnder: p.drawUnder, drawOver: p.drawOver }
  }, [p.data, p.drawUnder, p.drawOver])

  const savePng = () => {
    const u = plot.current
    if (!u) return
    const url = chartPng(u, p.title, p.lines)
    void host().exportFile({ suggestedName: `${fileStem(p.title)}.png`, kind: 'png', base64: url.slice(url.indexOf(',') + 1) })
  }

  return (
    <figure class={`chart${p.stale ? ' is-stale' : ''}`} data-chart={p.name} data-y-scale={p.yLog ? 'log' : 'linear'}>
      <figcaption>
        <span class="chart-title">{p.title}</span>
        {p.stale && <span class="stale-tag">stale</span>}
        <button type="button" class="small ghost no-print" onClick={savePng} title={`Save “${p.title}” as a PNG picture`}>
          PNG
        </button>
      </figcaption>
      <p class="sr-only" data-chart-axes>{axesInWords(p)}</p>
      <div class="chart-box" ref={box} />
    </figure>
  )
}
