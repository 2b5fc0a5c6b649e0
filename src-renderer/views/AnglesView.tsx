// Scattering by angle: the population phase function (log scale) and the degree of linear polarisation.
import { useMemo } from 'preact/hooks'
import { Chart, type Line } from '../charts/Chart.tsx'
import { store, useApp } from '../state/store.ts'
import { shownSamples } from '../shown.ts'
import { StaleNote, withResults } from './common.tsx'
import type { AngularOptics } from '../../src-core/index.ts'

function pick(list: AngularOptics[], nm: number): AngularOptics | undefined {
  return list.reduce<AngularOptics | undefined>((best, a) => (!best || Math.abs(a.wavelength_nm - nm) < Math.abs(best.wavelength_nm - nm) ? a : best), undefined)
}

let chosenNm = 550

export function AnglesView() {
  const s = useApp()
  const shown = shownSamples(s)
  const ok = withResults(shown)
  const available = [...new Set(ok.flatMap((x) => x.result.optics.angular.map((a) => a.wavelength_nm)))].sort((a, b) => a - b)
  const nm = available.includes(chosenNm) ? chosenNm : (pick(ok[0]?.result.optics.angular ?? [], 550)?.wavelength_nm ?? 550)
  const stale = shown.some((x) => x.stale)

  const charts = useMemo(() => {
    const series = ok.map((x) => ({ x, a: pick(x.result.optics.angular, nm) })).filter((e) => e.a)
    if (!series.length) return null
    const angles = series[0].a!.angles_deg
    const lines = series.map((e): Line => ({ label: e.x.sample.name, stroke: e.x.style.stroke, dash: e.x.style.dash }))
    return {
      phase: [angles, ...series.map((e) => e.a!.phase)],
      pol: [angles, ...series.map((e) => e.a!.polarization.map((p) => p * 100))],
      lines
    }
  }, [...ok.map((x) => x.result), nm, s.theme])

  return (
    <div class="view" data-view="angles">
      <StaleNote shown={shown} />
      <div class="row">
        <label class="field inline">
          <span>Wavelength</span>
          <select
            value={nm}
            onChange={(e) => {
              chosenNm = Number((e.target as HTMLSelectElement).value)
              store().set({})
            }}
          >
            {available.map((w) => (
              <option key={w} value={w}>
                {w} nm
              </option>
            ))}
          </select>
        </label>
        <p class="help">Phase function normalised to 4π over the sphere; polarisation −S₁₂/S₁₁ of the whole population.</p>
      </div>
      {charts ? (
        <div class="chart-grid two">
          <Chart name="phase-function" title={`Phase function at ${nm} nm`} data={charts.phase} lines={charts.lines} xLabel="Scattering angle (°)" yLabel="P(θ)" yLog xRange={[0, 180]} theme={s.theme} stale={stale} height={300} />
          <Chart name="polarisation" title={`Degree of linear polarisation at ${nm} nm`} data={charts.pol} lines={charts.lines} xLabel="Scattering angle (°)" yLabel="−S₁₂/S₁₁ (%)" xRange={[0, 180]} theme={s.theme} stale={stale} height={300} />
        </div>
      ) : (
        <p class="empty">No angular results yet.</p>
      )}
    </div>
  )
}
