// Humidity response: f(RH), the scattering at each humidity over the dry scattering, with this sample's RH marked.
import { useMemo } from 'preact/hooks'
import type uPlot from 'uplot'
import { Chart, type Line } from '../charts/Chart.tsx'
import { fixed, num } from '../format.ts'
import { useApp } from '../state/store.ts'
import { shownSamples } from '../shown.ts'
import { StaleNote, Swatch, withResults } from './common.tsx'

export function HumidityView() {
  const s = useApp()
  const shown = shownSamples(s)
  // a result whose f(RH) curve is still being computed (a partial result) has no points yet
  const ok = withResults(shown).filter((x) => x.result.humidity.f.length > 0)
  const pending = withResults(shown).filter((x) => x.result.humidity.f.length === 0)
  const stale = shown.some((x) => x.stale)
  const chart = useMemo(() => {
    if (!ok.length) return null
    const rh = ok[0].result.humidity.rh_percent
    const lines = ok.map((x): Line => ({ label: x.sample.name, stroke: x.style.stroke, dash: x.style.dash }))
    const marks = ok.map((x) => ({ rh: x.sample.rh_percent, stroke: x.style.stroke }))
    const drawOver = (u: uPlot) => {
      const ctx = u.ctx
      ctx.save()
      ctx.setLineDash([3, 4])
      ctx.lineWidth = 1.5 * devicePixelRatio
      for (const m of marks) {
        const x = u.valToPos(m.rh, 'x', true)
        ctx.strokeStyle = m.stroke
        ctx.beginPath()
        ctx.moveTo(x, u.bbox.top)
        ctx.lineTo(x, u.bbox.top + u.bbox.height)
        ctx.stroke()
      }
      ctx.restore()
    }
    return { data: [rh, ...ok.map((x) => x.result.humidity.f)], lines, drawOver, nm: ok[0].result.humidity.wavelength_nm }
  }, [...ok.map((x) => x.result), ...ok.map((x) => x.sample.rh_percent), s.theme])

  return (
    <div class="view" data-view="humidity">
      <StaleNote shown={shown} />
      {chart && pending.length > 0 && (
        <p class="help" data-testid="f-rh-pending">
          No f(RH) curve yet for {pending.map((x) => x.sample.name).join(', ')}.
        </p>
      )}
      {chart ? (
        <>
          <Chart name="f-rh" title={`Humidity growth of scattering f(RH) at ${chart.nm} nm`} data={chart.data} lines={chart.lines} xLabel="Relative humidity (%)" yLabel="f(RH) = σsca(RH)/σsca(dry)" xRange={[0, 100]} theme={s.theme} stale={stale} height={320} drawOver={chart.drawOver} />
          <table class="grid-table numbers">
            <caption>At each sample's own humidity (dotted line in the chart)</caption>
            <thead>
              <tr>
                <th scope="col">Sample</th>
                <th scope="col">RH (%)</th>
                <th scope="col">History</th>
                <th scope="col" title="Wet particle volume over dry volume">V wet / V dry</th>
                <th scope="col" title="f(RH) at the computed humidity nearest to 85 %">f(RH) near 85 %</th>
              </tr>
            </thead>
            <tbody>
              {ok.map((x) => {
                const h = x.result.humidity
                const k = h.rh_percent.reduce((b, v, i) => (Math.abs(v - 85) < Math.abs(h.rh_percent[b] - 85) ? i : b), 0)
                return (
                  <tr key={x.id}>
                    <th scope="row">
                      <Swatch shown={x} /> {x.sample.name}
                    </th>
                    <td>{num(x.sample.rh_percent, 3)}</td>
                    <td>{x.sample.rh_history}</td>
                    <td>{fixed(x.result.optics.wet_volume_um3_cm3 / x.result.optics.volume_um3_cm3, 3)}</td>
                    <td>
                      {fixed(h.f[k], 3)}
                      {h.rh_percent[k] !== 85 ? ` (at ${num(h.rh_percent[k], 3)} %)` : ''}
                    </td>
                  </tr>
                )
              })}
            </tbody>
          </table>
        </>
      ) : (
        <p class="empty">{withResults(shown).length ? 'The f(RH) curve is being computed…' : 'No humidity results yet.'}</p>
      )}
    </div>
  )
}
