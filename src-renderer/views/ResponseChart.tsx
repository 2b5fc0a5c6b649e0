// The optical particle counter's response: the light scattered into its collection angles against diameter, for
// the calibration spheres and for the sample's index (from src-core's rebinOpcEdges), with each bin edge drawn as
// a step from its calibration diameter to the true diameter that scatters as much.
import { useMemo } from 'preact/hooks'
import type uPlot from 'uplot'
import type { RebinResult } from '../../src-core/index.ts'
import { Chart, type Line } from '../charts/Chart.tsx'
import { insidePlot } from '../charts/heatGrid.ts'
import { lineStyle } from '../charts/palette.ts'
import { fixed, num } from '../format.ts'
import { useApp } from '../state/store.ts'

export function ResponseChart(p: { r: RebinResult; stale: boolean }) {
  const theme = useApp().theme
  const c = p.r.response
  const chart = useMemo(() => {
    if (!c) return null
    const cal = lineStyle(0, theme)
    const smp = lineStyle(1, theme)
    const idx = (m: { n: number; k: number }) => `${fixed(m.n, 3)} + ${num(m.k, 3)}i`
    const lines: Line[] = [
      { label: `calibration spheres (${idx(p.r.calibration_index)})`, stroke: cal.stroke, dash: cal.dash },
      { label: `sample (${idx(p.r.sample_index)})`, stroke: smp.stroke, dash: smp.dash },
      { label: 'bin edge: ○ as calibrated → □ true', stroke: theme === 'light' ? '#14171a' : '#eef1f4', dash: [2, 3] }
    ]
    const edges = p.r.edges
    const ink = theme === 'light' ? '#14171a' : '#eef1f4'
    const over = (u: uPlot) =>
      insidePlot(u, (ctx, px) => {
        for (const e of edges) {
          const y = u.valToPos(e.response, 'y', true)
          const x0 = u.valToPos(e.calibration_um, 'x', true)
          const x1 = u.valToPos(e.true_um, 'x', true)
          ctx.strokeStyle = ink
          ctx.lineWidth = 1 * px
          ctx.setLineDash([2 * px, 3 * px])
          ctx.beginPath()
          ctx.moveTo(x0, y)
          ctx.lineTo(x1, y)
          ctx.stroke()
          ctx.setLineDash([])
          ctx.lineWidth = 1.5 * px
          ctx.strokeStyle = cal.stroke
          ctx.beginPath()
          ctx.arc(x0, y, 4 * px, 0, 2 * Math.PI)
          ctx.stroke()
          ctx.strokeStyle = smp.stroke
          ctx.strokeRect(x1 - 3.5 * px, y - 3.5 * px, 7 * px, 7 * px)
        }
      })
    return { data: [c.diameter_um, c.calibration, c.sample, c.diameter_um.map(() => null)], lines, over }
  }, [p.r, theme])
  if (!chart || !c) return null
  return (
    <div data-testid="opc-response" data-points={c.diameter_um.length} data-edges={p.r.edges.length}>
      <Chart
        name="opc-response"
        title={`Counter response at ${num(p.r.wavelength_nm, 5)} nm, ${num(p.r.low_deg, 4)}°–${num(p.r.high_deg, 4)}°`}
        data={chart.data}
        lines={chart.lines}
        xLabel="Diameter (µm)"
        yLabel="R(D), relative"
        xLog
        yLog
        theme={theme}
        stale={p.stale}
        height={230}
        drawOver={chart.over}
      />
      <p class="table-note">
        R(D) = ∫ S11 sin θ dθ over the collection angles (Mie theory; the same constant factor for both curves). Each dotted step joins a bin edge as calibrated (○, on the
        calibration curve) to the true diameter of the sample’s particles with the same response (□).
      </p>
    </div>
  )
}
