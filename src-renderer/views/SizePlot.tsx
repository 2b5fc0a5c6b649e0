// The size distribution of the sample (and of the compared samples): number, surface or volume per log D.
import { useMemo } from 'preact/hooks'
import { Chart, type Line } from '../charts/Chart.tsx'
import { store, useApp, type SizeCurves } from '../state/store.ts'
import { shownSamples } from '../shown.ts'
import { problemsOf } from '../compute/client.ts'

const MOMENTS = {
  number: { label: 'dN/dlogDp (cm⁻³)', key: 'number' },
  surface: { label: 'dS/dlogDp (µm² cm⁻³)', key: 'surface' },
  volume: { label: 'dV/dlogDp (µm³ cm⁻³)', key: 'volume' }
} as const

/** Puts curves on different diameter grids onto one x array (uPlot's aligned data), with gaps elsewhere. */
function align(curves: SizeCurves[], key: 'number' | 'surface' | 'volume'): (number | null)[][] {
  const xs = [...new Set(curves.flatMap((c) => c.diameter_um))].sort((a, b) => a - b)
  const data: (number | null)[][] = [xs]
  for (const c of curves) {
    const at = new Map<number, number>()
    c.diameter_um.forEach((d, i) => at.set(d, c[key][i]))
    data.push(xs.map((x) => at.get(x) ?? null))
  }
  return data
}

export function SizePlot() {
  const s = useApp()
  const shown = shownSamples(s)
  const entries = shown.map((x) => ({ x, c: s.sizes[x.id] }))
  const curves = entries.filter((e): e is { x: typeof e.x; c: SizeCurves } => !!e.c && !('error' in e.c))
  const m = MOMENTS[s.sizeMoment]
  const data = useMemo(() => align(curves.map((e) => e.c), m.key), [curves.map((e) => e.c).join(), ...curves.map((e) => e.c), m.key])
  const lines: Line[] = useMemo(
    () => curves.map((e) => ({ label: e.x.sample.name, stroke: e.x.style.stroke, dash: e.x.style.dash, steps: e.c.measured })),
    [curves.map((e) => `${e.x.sample.name}${e.x.style.stroke}${e.c.measured}`).join('|')]
  )
  // the curves are not from the current inputs where the sample's inputs need attention (they are then not made
  // again: see compute/client.ts), or where none came yet
  const needsFix =
    entries.some((e) => e.c && 'error' in e.c) ||
    shown.some((x) => Object.keys(s.drafts).some((p) => p.startsWith(`samples[${x.index}]`)) || problemsOf(s.problems, x.index).some((p) => p.path.startsWith(`samples[${x.index}]`)))
  const stale = entries.some((e) => !e.c) || needsFix
  return (
    <div class="size-plot">
      <div class="row" role="radiogroup" aria-label="Distribution shown">
        {(Object.keys(MOMENTS) as (keyof typeof MOMENTS)[]).map((k) => (
          <label key={k} class="radio">
            <input type="radio" name="size-moment" checked={s.sizeMoment === k} onChange={() => store().set({ sizeMoment: k })} />
            {k}
          </label>
        ))}
      </div>
      {curves.length > 0 ? (
        <Chart
          name="size-distribution"
          title="Size distribution (dry)"
          data={data}
          lines={lines}
          xLabel="Dry diameter Dp (µm)"
          yLabel={m.label}
          xLog
          xRange={[0.001, 100]}
          height={190}
          theme={s.theme}
          stale={stale}
        />
      ) : (
        <p class="empty" data-testid="size-plot-empty">
          {needsFix ? 'No distribution to draw: fix the inputs marked above.' : 'Drawing the size distribution…'}
        </p>
      )}
    </div>
  )
}
