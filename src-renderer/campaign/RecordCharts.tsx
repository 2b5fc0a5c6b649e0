// The record's stacked charts on one time axis: the size distribution as a colour map, the coefficients computed
// and measured, their ratio, ω and g, the Ångström exponent, number and mass. Zoom and pan move every chart
// (mouse wheel to zoom, Shift+wheel to pan, Shift+drag or a middle-button drag to pan; on the focused stack + − ← →
// and Home); a plain drag marks a stretch on all of them; the hover read-out gives every figure at the time under the pointer. Gaps are null: lines stop.
import { useEffect, useMemo, useRef, useState } from 'preact/hooks'
import { bevelJoins } from '../charts/bevelJoins.ts'
import uPlot from 'uplot'
import 'uplot/dist/uPlot.min.css'
import { recordColumns, recordSeries, type CampaignRecord, type RecordColumns, type RecordSeries } from '../../src-core/index.ts'
import { themedAxis } from '../charts/axis.ts'
import { lineStyle, type Theme } from '../charts/palette.ts'
import { colourCss, colourRange, drawColourMap } from './colourMap.ts'
import { decimate, envelopes, type Shown } from './decimate.ts'
import { cssVar, decadeTicks, panels, timeLabels, tzDate, type Panel } from './panels.ts'
import { decade, indexOfRow, readoutOf, rowNear } from './readout.ts'
import { shownPlots } from './recordPng.ts'
import { campaignStore, setMark, setVisible } from './session.ts'
import { chartsDrawn, chartsMoved } from './warm.ts'

export { recordPng } from './recordPng.ts'

export interface RecordChartsProps {
  record: CampaignRecord
  theme: Theme
}

/** A zoom or pan gesture is over when no other came for this long (ms). */
const SETTLE_MS = 200

export function RecordCharts({ record, theme }: RecordChartsProps) {
  const box = useRef<HTMLDivElement>(null)
  const series = useMemo(() => recordColumns(record), [record])
  const list = useMemo(() => panels(record, series), [record, series])
  const range = useMemo(() => colourRange(record), [record])
  const [hover, setHover] = useState<number | null>(null)
  const mark = useRef<[number, number] | null>(campaignStore().get().mark)

  useEffect(() => {
    const el = box.current
    if (!el) return
    el.innerHTML = ''
    const width = Math.max(320, el.clientWidth - 8)
    const ink = cssVar('--ink', el)
    const grid = cssVar('--grid', el)
    const markFill = theme === 'light' ? 'rgba(0, 96, 160, 0.16)' : 'rgba(86, 180, 233, 0.22)'
    const plots: uPlot[] = []
    const keys = [...new Set(list.flatMap((p) => p.lines.map((l) => l.key)))]
    const buckets = Math.max(100, Math.round(width))
    const env = envelopes(series, keys)
    let shown: Shown = decimate(series, keys, x0Of(series), Infinity, buckets, env)
    const dataFor = (p: Panel, d: Shown): (number | null)[][] => {
      const e = record.edgesUm
      // the map's one series only spans the diameter axis (its first two points at the ends, drawn in no colour)
      const span = d.x.map((_, i): number | null => (i === 0 ? e[0] : i === 1 ? e[e.length - 1] : null))
      return [d.x, ...(p.map ? [span] : p.lines.map((l) => d.values[l.key]!))]
    }
    const x0 = series.x[0]
    const x1 = series.x[series.x.length - 1] + record.intervalMs / 1000
    const bandOf = (u: uPlot) => {
      const m = mark.current
      if (!m) return
      const a = u.valToPos(m[0] / 1000, 'x', true)
      const b = u.valToPos(m[1] / 1000, 'x', true)
      const { top, height } = u.bbox
      u.ctx.save()
      u.ctx.fillStyle = markFill
      u.ctx.fillRect(Math.min(a, b), top, Math.max(2, Math.abs(b - a)), height)
      u.ctx.restore()
    }
    const axis = (label: string, side?: number): uPlot.Axis => ({ ...themedAxis(label, ink, grid, side), size: 56, space: 24 })
    for (const p of list) {
      const fig = document.createElement('figure')
      fig.className = 'chart record-chart'
      fig.dataset['chart'] = p.name
      const cap = document.createElement('figcaption')
      cap.innerHTML = `<span class="chart-title"></span>`
      cap.firstElementChild!.textContent = p.title
      const axesWords = document.createElement('p')
      axesWords.className = 'sr-only'
      axesWords.dataset['chartAxes'] = ''
      axesWords.textContent = `${p.yLabel}${p.yLog ? ' (log scale)' : ''} against time (UTC).${p.lines.length ? ` Lines: ${p.lines.map((l) => l.label).join('; ')}` : ' Colours: log dN/dlogD.'}`
      fig.append(cap, axesWords)
      const holder = document.createElement('div')
      fig.append(holder)
      el.append(fig)
      const e = record.edgesUm
      const data = dataFor(p, shown)
      const opts: uPlot.Options = {
        width,
        height: p.height,
        tzDate,
        pxAlign: 0,
        scales: {
          x: { time: true, range: (u, lo, hi) => [lo ?? x0, hi ?? x1] },
          y: p.map ? { distr: 3, log: 10, range: (): uPlot.Range.MinMax => [e[0], e[e.length - 1]] } : p.yLog ? { distr: 3, log: 10 } : {},
          ...(p.y2Label ? { y2: {} } : {})
        },
        legend: { show: !p.map, live: false },
        cursor: { sync: { key: 'motebench-record' }, drag: { x: true, y: false, setScale: false }, points: { show: false } },
        axes: [
          { ...axis(''), space: 70, values: timeLabels },
          p.map ? { ...axis(p.yLabel), splits: () => decadeTicks(e[0], e[e.length - 1]), filter: (_u: uPlot, s: number[]) => s, values: (_u: uPlot, s: number[]) => s.map((v) => (v == null ? '' : String(Number(v.toPrecision(3))))) } : axis(p.yLabel),
          // every chart keeps the same room on the right, so that the time axes line up
          p.y2Label ? { ...axis(p.y2Label, 1), scale: 'y2' } : { scale: 'y', side: 1, size: 72, stroke: 'transparent', grid: { show: false }, ticks: { show: false }, splits: () => [], values: () => [] }
        ],
        series: [
          { label: 'time' },
          ...(p.map
            ? [{ label: 'dN/dlogD', show: true, stroke: 'transparent', points: { show: false } } as uPlot.Series]
            : p.lines.map((l): uPlot.Series => {
                const st = lineStyle(l.style, theme)
                return { label: l.label, stroke: st.stroke, dash: st.dash, width: 1.6, scale: l.axis === 1 ? 'y2' : 'y', points: { show: false } }
              }))
        ],
        hooks: {
          draw: [(u) => (p.map ? drawColourMap(u, record, range) : undefined), bandOf],
          setSelect: [
            (u) => {
              if (u.select.width < 3) return
              const a = u.posToVal(u.select.left, 'x') * 1000
              const b = u.posToVal(u.select.left + u.select.width, 'x') * 1000
              mark.current = [a, b]
              setMark([a, b])
              u.setSelect({ left: 0, top: 0, width: 0, height: 0 }, false)
              for (const q of plots) q.redraw(false)
            }
          ],
          setCursor: [
            (u) => {
              if (u !== plots[0]) return
              const i = u.cursor.idx
              setHover(i === null || i === undefined ? null : rowNear(record, shown.x[i]))
            }
          ]
        }
      }
      const u = new uPlot(opts, data as uPlot.AlignedData, holder)
      // a dense line's round joins were most of a settled chart's frame (charts/bevelJoins.ts)
      if (!p.map) bevelJoins(u.ctx)
      // the plotted data, for tests and the read-out: what this chart draws
      // (as recordSeries gives it, with nulls: made when it is read, not for the charts)
      Object.defineProperty(fig, 'plotted', { get: () => { const s = plottedOf(record); return { x: s.x, series: p.map ? [] : p.lines.map((l) => ({ label: l.label, values: s.values[l.key] })) } } })
      // what it shows now, for tests: its time range and its lines' widths
      ;(fig as unknown as { drawn: () => unknown }).drawn = () => ({ x: [u.scales.x.min, u.scales.x.max], widths: p.map ? [] : u.series.slice(1).map((s) => s.width), join: p.map ? null : u.ctx.lineJoin })
      plots.push(u)
    }
    shownPlots.plots = plots
    shownPlots.titles = list.map((p) => p.title)
    // While zooming or panning, lines are stroked one device pixel wide (Chromium's raster draws a line of 1.6 px
    // with its round joins 10–20 times slower than that, and it was most of a redraw), and a chart of lines out of
    // view is left as it was (it is brought to the range when it comes into view); once the gesture settles, each
    // chart is drawn again at its own widths and range, one chart a frame, so the settled charts are today's.
    const full = plots.map((u) => u.series.map((s) => s.width ?? 1))
    const thin = 1 / (window.devicePixelRatio || 1)
    const hasLines = list.map((p) => !p.map)
    const inView = plots.map(() => true)
    const stale = plots.map(() => false)
    let current: [number, number] = [x0, x1]
    /** Chart k to the range shown. */
    const update = (k: number) => {
      stale[k] = false
      const q = plots[k]
      q.batch(() => {
        q.setData(dataFor(list[k], shown) as uPlot.AlignedData, false)
        q.setScale('x', { min: current[0], max: current[1] })
      })
    }
    const seen = new IntersectionObserver((entries) => {
      for (const en of entries) {
        const k = plots.findIndex((q) => q.root.parentElement === en.target)
        if (k < 0) continue
        inView[k] = en.isIntersecting
        if (inView[k] && stale[k]) update(k)
      }
    })
    for (const q of plots) if (q.root.parentElement) seen.observe(q.root.parentElement)
    let settleTimer: ReturnType<typeof setTimeout> | undefined
    let settleFrame = 0
    let unsettled: number[] = []
    const gesture = () => {
      chartsMoved()
      clearTimeout(settleTimer)
      cancelAnimationFrame(settleFrame)
      settleFrame = 0
      plots.forEach((u, k) => u.series.forEach((s, i) => i > 0 && (s.width = Math.min(full[k][i], thin))))
      unsettled = plots.map((_u, k) => k).filter((k) => hasLines[k])
      el.dataset['settled'] = 'false'
      settleTimer = setTimeout(() => (settleFrame = requestAnimationFrame(settleNext)), SETTLE_MS)
    }
    /** The next chart drawn at its own widths and range. */
    const settleOne = () => {
      const k = unsettled.shift()
      if (k === undefined) return
      plots[k].series.forEach((s, i) => (s.width = full[k][i]))
      if (stale[k]) update(k)
      else plots[k].redraw(false)
    }
    /** One chart a frame. */
    const settleNext = () => {
      settleFrame = 0
      settleOne()
      if (unsettled.length) settleFrame = requestAnimationFrame(settleNext)
      else el.dataset['settled'] = 'true'
    }
    /** Every chart at its own widths and range now (for the PNG export). */
    shownPlots.settle = () => {
      clearTimeout(settleTimer)
      cancelAnimationFrame(settleFrame)
      settleFrame = 0
      while (unsettled.length) settleOne()
      el.dataset['settled'] = 'true'
    }
    el.dataset['settled'] = 'true'
    /** Every chart to [lo, hi] (s): the points of that range (decimated to the width), then the scale. */
    let visibleTimer: ReturnType<typeof setTimeout> | undefined
    const show = (lo: number, hi: number, settled = false) => {
      if (!settled) gesture()
      current = [lo, hi]
      shown = decimate(series, keys, lo, hi, buckets, env)
      // the colour map's chart always: the hover read-out goes by its cursor
      plots.forEach((_q, k) => (settled || inView[k] || !hasLines[k] ? update(k) : (stale[k] = true)))
      el.dataset['from'] = String(lo)
      el.dataset['to'] = String(hi)
      // the visible range is for the CSV button: said after the zoom settles, so the page does not re-render in the redraw's frame
      clearTimeout(visibleTimer)
      visibleTimer = setTimeout(() => setVisible([lo * 1000, hi * 1000]), 250)
    }
    const vis = campaignStore().get().visible
    if (vis) show(vis[0] / 1000, vis[1] / 1000, true)
    chartsDrawn(record)

    // mouse: the wheel zooms around the pointer; Shift+wheel (or a sideways wheel) pans
    // wheel events come faster than frames: they add up to one range, drawn once a frame
    let wheelTarget: [number, number] | null = null
    let wheelFrame = 0
    const wheelNow = () => {
      wheelFrame = 0
      if (wheelTarget) zoomTo(wheelTarget[0], wheelTarget[1])
      wheelTarget = null
    }
    const onWheel = (ev: WheelEvent) => {
      const u = plots.find((q) => q.over.contains(ev.target as Node))
      if (!u) return
      ev.preventDefault()
      const [min, max] = wheelTarget ?? current
      const span = max - min
      let next: [number, number] | null
      if (ev.shiftKey || Math.abs(ev.deltaX) > Math.abs(ev.deltaY)) {
        const by = (Math.sign(ev.deltaX || ev.deltaY) * span) / 8
        next = clamped(min + by, max + by)
      } else {
        const box = u.over.getBoundingClientRect()
        const at = min + ((ev.clientX - box.left) / Math.max(1, box.width)) * span
        const f = ev.deltaY > 0 ? 1.25 : 0.8
        next = clamped(at - (at - min) * f, at + (max - at) * f)
      }
      if (!next) return
      wheelTarget = next
      wheelFrame ||= requestAnimationFrame(wheelNow)
    }
    /** [a, b] (s) kept inside the record and wider than one step; null when it cannot be. */
    const clamped = (a: number, b: number): [number, number] | null => {
      const span = Math.min(b - a, x1 - x0)
      if (!(span > record.intervalMs / 1000)) return null
      let lo = Math.max(x0, a)
      let hi = lo + span
      if (hi > x1) (hi = x1), (lo = x1 - span)
      return [lo, hi]
    }
    const zoomTo = (a: number, b: number) => {
      const r = clamped(a, b)
      if (r) show(r[0], r[1])
    }
    const onKey = (ev: KeyboardEvent) => {
      const [min, max] = current
      const span = max - min
      const mid = (min + max) / 2
      const act: Record<string, () => void> = {
        '+': () => zoomTo(mid - span * 0.4, mid + span * 0.4),
        '=': () => zoomTo(mid - span * 0.4, mid + span * 0.4),
        '-': () => zoomTo(mid - span * 0.625, mid + span * 0.625),
        ArrowLeft: () => zoomTo(min - span / 8, max - span / 8),
        ArrowRight: () => zoomTo(min + span / 8, max + span / 8),
        Home: () => zoomTo(x0, x1)
      }
      const f = act[ev.key]
      if (f) {
        ev.preventDefault()
        f()
      }
    }
    // mouse: Shift+drag or a middle-button drag pans (taken before uPlot sees it, so it marks nothing); the charts
    // follow the pointer once a frame
    let pan: { x: number; min: number; max: number; perPx: number; to: number; frame: number } | null = null
    const onPanMove = (ev: MouseEvent) => {
      if (!pan) return
      pan.to = ev.clientX
      if (pan.frame) return
      pan.frame = requestAnimationFrame(panNow)
    }
    const panNow = () => {
      if (!pan) return
      pan.frame = 0
      const by = (pan.x - pan.to) * pan.perPx
      zoomTo(pan.min + by, pan.max + by)
    }
    const onPanEnd = () => {
      if (pan?.frame) (cancelAnimationFrame(pan.frame), panNow())
      pan = null
      window.removeEventListener('mousemove', onPanMove)
      window.removeEventListener('mouseup', onPanEnd)
    }
    const onDown = (ev: MouseEvent) => {
      const u = plots.find((q) => q.over.contains(ev.target as Node))
      if (!u || !(ev.button === 1 || (ev.button === 0 && ev.shiftKey))) return
      const [min, max] = current
      ev.preventDefault()
      ev.stopPropagation()
      pan = { x: ev.clientX, min, max, perPx: (max - min) / Math.max(1, u.over.clientWidth), to: ev.clientX, frame: 0 }
      window.addEventListener('mousemove', onPanMove)
      window.addEventListener('mouseup', onPanEnd)
    }
    el.addEventListener('mousedown', onDown, { capture: true })
    el.addEventListener('wheel', onWheel, { passive: false })
    el.addEventListener('keydown', onKey)
    zoomControls.zoom = (a, b) => zoomTo(a / 1000, b / 1000)
    zoomControls.whole = () => zoomTo(x0, x1)
    zoomControls.step = (k) => onKey(new KeyboardEvent('keydown', { key: k }))
    const unsub = campaignStore().subscribe(() => {
      const m = campaignStore().get().mark
      if (m !== mark.current) {
        mark.current = m
        for (const q of plots) q.redraw(false)
      }
    })
    const ro = new ResizeObserver(() => {
      const w = Math.max(320, el.clientWidth - 8)
      for (const q of plots) if (Math.abs(q.width - w) > 2) q.setSize({ width: w, height: q.height })
    })
    ro.observe(el)
    return () => {
      unsub()
      clearTimeout(visibleTimer)
      clearTimeout(settleTimer)
      cancelAnimationFrame(settleFrame)
      seen.disconnect()
      shownPlots.settle = () => {}
      ro.disconnect()
      onPanEnd()
      cancelAnimationFrame(wheelFrame)
      el.removeEventListener('mousedown', onDown, { capture: true })
      el.removeEventListener('wheel', onWheel)
      el.removeEventListener('keydown', onKey)
      for (const q of plots) q.destroy()
      shownPlots.plots = []
    }
  }, [record, theme, list, series, range])

  const row = hover ?? -1
  const readout = row >= 0 ? readoutOf(record, series, indexOfRow(series, row), row) : null
  return (
    <div class="record-charts">
      <div class="record-legend" data-testid="record-colour-legend">
        <span>dN/dlogD (cm⁻³), log scale:</span>
        <span data-testid="record-colour-low">{decade(range[0])} or less</span>
        <span class="record-scale" style={{ background: `linear-gradient(to right, ${[0, 0.25, 0.5, 0.75, 1].map(colourCss).join(', ')})` }} />
        <span data-testid="record-colour-high">{decade(range[1])}</span>
        <span class="muted">; no colour: no distribution (a gap)</span>
      </div>
      <div class="record-stack" ref={box} tabIndex={0} aria-label="Record charts: + and − zoom, ← → pan, Home shows the whole record; drag across to mark a stretch, Shift+drag to pan" data-testid="record-stack" />
      <div class="record-readout" data-testid="record-readout" aria-live="off">
        {readout ? (
          <dl>
            {readout.map(([k, v]) => (
              <div key={k}>
                <dt>{k}</dt>
                <dd>{v}</dd>
              </div>
            ))}
          </dl>
        ) : (
          <p class="muted">Point at a chart to read every figure at that time.</p>
        )}
      </div>
    </div>
  )
}

const x0Of = (s: RecordColumns) => s.x[0] ?? 0

/** The full series with nulls of the last record asked (what each chart's `plotted` gives). */
let plottedFor: { record: CampaignRecord; series: RecordSeries } | null = null
function plottedOf(record: CampaignRecord): RecordSeries {
  if (plottedFor?.record !== record) plottedFor = { record, series: recordSeries(record) }
  return plottedFor.series
}

/** Zoom the stack from outside (buttons, typed stretch). */
export const zoomControls: { zoom: (fromMs: number, toMs: number) => void; whole: () => void; step: (key: string) => void } = { zoom: () => {}, whole: () => {}, step: () => {} }
