// What a Monte Carlo run says: P(warm) with its standard error, the forcing histogram, each figure's median and
// 5–95 % range, and which inputs matter (Spearman rank correlation).
import { Fragment } from 'preact'
import { useMemo } from 'preact/hooks'
import { UNCERTAINTY_VERDICT_FIGURE, type UncertaintyResult } from '../../src-core/index.ts'
import { Chart, type Line } from '../charts/Chart.tsx'
import { drawVertical } from '../charts/heatGrid.ts'
import { forcingColour, type Theme } from '../charts/palette.ts'
import { fixed, num, signed } from '../format.ts'

const pct = (p: number) => `${num(p * 100, 3)} %`

export function Probability(p: { r: UncertaintyResult; verdict?: string; stale: boolean }) {
  const w = p.r.warming
  const forcing = p.r.figures.find((f) => f.key === UNCERTAINTY_VERDICT_FIGURE)
  const word = w.probability >= 0.95 ? 'warms' : w.probability <= 0.05 ? 'cools' : 'undecided'
  const head =
    w.positives === 0
      ? 'No draw warms'
      : w.positives === w.count
        ? 'Every draw warms'
        : w.probability > 0.5
          ? `Warms in ${pct(w.probability)} of the draws`
          : `Cools in ${pct(1 - w.probability)} of the draws`
  const status =
    p.r.status === 'precision reached'
      ? `stopped early after ${p.r.draws} of at most ${p.r.requested_draws} draws: P(warm) was settled to the precision asked for`
      : p.r.status === 'cancelled'
        ? `cancelled after ${p.r.draws} of ${p.r.requested_draws} draws; the figures are from those draws only`
        : `all ${p.r.draws} draws made`
  return (
    <section class={`verdict u-verdict v-${word === 'warms' ? 'warms' : word === 'cools' ? 'cools' : 'too-close-to-call'}${p.stale ? ' is-stale' : ''}`} data-testid="p-warm" data-probability={w.probability} data-status={p.r.status} data-draws={p.r.draws} aria-live="polite">
      <h3>
        <span class="verdict-word">{head}</span>
        {p.stale && <span class="stale-tag">stale</span>}
      </h3>
      <p class="explanation">
        P(warm), the probability that this layer warms (net forcing, sunlight + infrared, above 0), is <strong data-testid="p-warm-value">{fixed(w.probability, 3)}</strong> ± {fixed(w.standard_error, 3)} (binomial standard error): {w.positives} of {w.count} draws warm.
        {w.positives === 0 || w.positives === w.count ? ' With every draw on one side the standard error is 0; it only shows that the other outcome is rare, not impossible.' : ''}
      </p>
      <p class="explanation">
        The plain calculation gives {signed(forcing?.central)} W m⁻²{p.verdict ? <Fragment>; the verdict in “Warming or cooling” is <strong data-testid="plain-verdict">{p.verdict}</strong></Fragment> : ''}. Run: {status}; seed {p.r.seed},{' '}
        {p.r.sampling === 'latin-hypercube' ? 'Latin hypercube' : 'simple random'} sampling.
      </p>
    </section>
  )
}

export function Histogram(p: { r: UncertaintyResult; theme: Theme; stale: boolean }) {
  const chart = useMemo(() => {
    const f = p.r.figures.find((x) => x.key === UNCERTAINTY_VERDICT_FIGURE)
    if (!f) return null
    let { edges, counts } = f.histogram
    if (counts.length === 1) {
      // Every draw gave the same forcing: one bar, with empty neighbours to give it a width.
      const w = Math.max(Math.abs(edges[0]) * 0.05, 0.01)
      edges = [edges[0] - 1.5 * w, edges[0] - 0.5 * w, edges[0] + 0.5 * w, edges[0] + 1.5 * w]
      counts = [0, counts[0], 0]
    }
    const centres = counts.map((_, j) => (edges[j] + edges[j + 1]) / 2)
    const lo = Math.min(edges[0], 0)
    const hi = Math.max(edges[edges.length - 1], 0)
    const pad = (hi - lo) * 0.06 || 0.05
    const cool = forcingColour(-0.85, p.theme)
    const warm = forcingColour(0.85, p.theme)
    const ink = p.theme === 'light' ? '#14171a' : '#eef1f4'
    const lines: Line[] = [
      { label: 'draws that cool (forcing < 0)', stroke: cool, fill: cool, bars: true },
      { label: 'draws that warm (forcing > 0)', stroke: warm, fill: warm, bars: true },
      { label: 'zero forcing', stroke: ink, dash: [6, 4] }
    ]
    return {
      data: [centres, counts.map((c, j) => (centres[j] <= 0 ? c : null)), counts.map((c, j) => (centres[j] > 0 ? c : null)), centres.map(() => null)],
      lines,
      xRange: [lo - pad, hi + pad] as [number, number],
      yRange: [0, Math.max(...counts) * 1.15] as [number, number],
      over: drawVertical(0, ink, p.theme, '← cools', 'warms →'),
      bins: f.histogram.counts.filter((c) => c > 0).length
    }
  }, [p.r, p.theme])
  if (!chart) return null
  return (
    <div data-testid="forcing-histogram" data-bins={chart.bins} data-zero={chart.xRange[0] <= 0 && chart.xRange[1] >= 0 ? 'inside' : 'outside'}>
    <Chart
      name="forcing-histogram"
      title={`Net forcing (sunlight + infrared) over ${p.r.draws} draws`}
      data={chart.data}
      lines={chart.lines}
      xLabel="Forcing (W m⁻²)"
      yLabel="Draws"
      xRange={chart.xRange}
      yRange={chart.yRange}
      theme={p.theme}
      stale={p.stale}
      height={220}
      drawOver={chart.over}
    />
    </div>
  )
}

const FIGURE_NAMES: Record<string, string> = {
  ext: 'σext, extinction',
  sca: 'σsca, scattering',
  abs: 'σabs, absorption',
  ssa: 'ω, single-scattering albedo',
  g: 'g, asymmetry parameter',
  upscatter: 'β̄, upscatter fraction',
  tau: 'τ, optical depth of the layer',
  forcing: 'Forcing, thin layer (the verdict’s sunlight part)',
  forcing_daily_mean: 'Forcing, thin layer through the site’s day',
  forcing_two_stream_toa: 'Forcing, two-stream at the top of the atmosphere',
  longwave_toa: 'Forcing, thermal infrared at the top of the atmosphere',
  net_toa: 'Net forcing, sunlight + infrared (the verdict’s)'
}

export function FiguresTable(p: { r: UncertaintyResult }) {
  const f = (x: number, key: string) => (key.startsWith('forcing') || key.endsWith('_toa') ? signed(x) : key === 'ssa' || key === 'g' || key === 'upscatter' ? fixed(x, 3) : num(x, 4))
  return (
    <table class="grid-table numbers u-figures" data-testid="uncertainty-table">
      <caption>Each figure at {p.r.wavelength_nm} nm over the draws</caption>
      <thead>
        <tr>
          <th scope="col">Figure</th>
          <th scope="col">Unit</th>
          <th scope="col" title="Without any perturbation">Plain</th>
          <th scope="col">Median</th>
          <th scope="col" title="5th to 95th percentile of the draws">5–95 % range</th>
          <th scope="col">Mean ± sd</th>
        </tr>
      </thead>
      <tbody>
        {p.r.figures.map((x) => (
          <tr key={x.key} data-figure={x.key}>
            <th scope="row" title={x.label}>
              {FIGURE_NAMES[x.key] ?? x.label}
            </th>
            <td class="text">{x.unit}</td>
            <td>{f(x.central, x.key)}</td>
            <td data-col="median">{f(x.median, x.key)}</td>
            <td data-col="range">
              {f(x.p05, x.key)} to {f(x.p95, x.key)}
            </td>
            <td>
              {f(x.mean, x.key)} ± {num(x.sd, 2)}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  )
}

export function SensitivityTable(p: { r: UncertaintyResult }) {
  const reading = (rho: number | null) =>
    rho === null ? 'did not vary' : Math.abs(rho) < 0.1 ? 'little monotonic effect' : rho > 0 ? `higher → warmer${Math.abs(rho) > 0.7 ? ' (dominant)' : ''}` : `higher → cooler${Math.abs(rho) > 0.7 ? ' (dominant)' : ''}`
  return (
    <table class="grid-table numbers u-sensitivity" data-testid="sensitivity-table">
      <caption>Which inputs matter: Spearman rank correlation ρ of each drawn input with the net forcing (sunlight + infrared), strongest first (±1: it alone orders the forcing; 0: no monotonic effect)</caption>
      <thead>
        <tr>
          <th scope="col">Input</th>
          <th scope="col" title="The drawn factor, offset or value: median and 5–95 % range">Drawn value</th>
          <th scope="col">ρ (Spearman)</th>
          <th scope="col">Reading</th>
        </tr>
      </thead>
      <tbody>
        {p.r.sensitivity.ranking.map((e, k) => {
          const v = p.r.inputs.find((x) => x.label === e.label)?.variate
          return (
            <tr key={k} data-input-label={e.label}>
              <th scope="row">{e.label}</th>
              <td>{v ? `${num(v.median, 3)} (${num(v.p05, 3)} to ${num(v.p95, 3)})` : '—'}</td>
              <td data-col="rho">{e.rho === null ? '—' : signed(e.rho, 2)}</td>
              <td class="text">{reading(e.rho)}</td>
            </tr>
          )
        })}
      </tbody>
    </table>
  )
}
