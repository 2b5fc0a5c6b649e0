// Side by side: the marked samples in one table, each compared with the first marked one (the reference).
import { sampleWarnings, type SampleResult, type WavelengthOptics } from '../../src-core/index.ts'
import { fixed, num, signed } from '../format.ts'
import { MAX_COMPARE } from '../state/actions.ts'
import { useApp } from '../state/store.ts'
import { isComparing, shownSamples } from '../shown.ts'
import { StaleNote, Swatch, withResults } from './common.tsx'
import { Warnings } from './Warnings.tsx'
import { ScrollWrap } from './ScrollWrap.tsx'

const at550 = (r: SampleResult): WavelengthOptics =>
  r.optics.wavelengths.reduce((b, w) => (Math.abs(w.wavelength_nm - 550) < Math.abs(b.wavelength_nm - 550) ? w : b), r.optics.wavelengths[0])

interface Row {
  label: string
  unit: string
  get: (r: SampleResult) => number | string
  show?: (v: number) => string
  /** Why the figure has no meaning for this sample, where it is withheld (shown as "—" with the reason). */
  why?: (r: SampleResult) => string | undefined
}

export const COMPARE_ROWS: Row[] = [
  { label: 'Number N', unit: 'cm⁻³', get: (r) => r.optics.number_cm3 },
  { label: 'Dry mass', unit: 'µg m⁻³', get: (r) => r.optics.mass_ug_m3 },
  { label: 'PM2.5', unit: 'µg m⁻³', get: (r) => r.optics.pm2_5_ug_m3 },
  { label: 'σext at 550 nm', unit: 'Mm⁻¹', get: (r) => at550(r).ext },
  { label: 'σsca at 550 nm', unit: 'Mm⁻¹', get: (r) => at550(r).sca },
  { label: 'σabs at 550 nm', unit: 'Mm⁻¹', get: (r) => at550(r).abs },
  { label: 'ω at 550 nm', unit: '', get: (r) => at550(r).ssa, show: (v) => fixed(v, 3) },
  { label: 'g at 550 nm', unit: '', get: (r) => at550(r).g, show: (v) => fixed(v, 3) },
  { label: 'β̄ at 550 nm', unit: '', get: (r) => at550(r).upscatter_fraction, show: (v) => fixed(v, 3) },
  { label: 'MEE at 550 nm (dry)', unit: 'm² g⁻¹', get: (r) => at550(r).mass_ext_dry },
  { label: 'AOD at 550 nm', unit: '', get: (r) => at550(r).optical_depth },
  { label: 'Ångström exponent (ext)', unit: '', get: (r) => r.optics.angstrom_fit.ext, show: (v) => fixed(v, 2) },
  { label: 'Ångström exponent (abs)', unit: '', get: (r) => r.optics.angstrom_fit.abs, show: (v) => fixed(v, 2), why: (r) => r.optics.angstrom_fit.withheld?.abs },
  { label: 'Visual range at 550 nm', unit: 'km', get: (r) => at550(r).visual_range_km, why: (r) => at550(r).withheld.visual_range_km },
  { label: 'Forcing (thin layer)', unit: 'W m⁻²', get: (r) => r.forcing.thin_layer_w_m2, show: (v) => signed(v) },
  { label: 'Forcing (two-stream, TOA)', unit: 'W m⁻²', get: (r) => r.forcing.two_stream.toa_w_m2, show: (v) => signed(v) },
  { label: 'ω_crit', unit: '', get: (r) => r.forcing.critical_ssa, show: (v) => fixed(v, 3) },
  { label: 'Verdict', unit: '', get: (r) => r.forcing.verdict }
]

function difference(v: number, ref: number): string {
  const d = v - ref
  const rel = ref !== 0 ? ` (${signed((100 * d) / Math.abs(ref), 3)} %)` : ''
  return `${signed(d)}${rel}`
}

export function CompareTable(p: { ok: ReturnType<typeof withResults> }) {
  const ref = p.ok[0]
  return (
    <>
    <ScrollWrap label="Samples side by side">
      <table class="grid-table numbers compare-table" data-testid="compare-table">
        <caption>Differences are against “{ref.sample.name}” (the first marked sample). Both forcing rows take each sample’s own β̄ at 550 nm.</caption>
        <thead>
          <tr>
            <th scope="col">Quantity</th>
            {p.ok.map((x, k) => (
              <th scope="col" key={x.id} data-sample={x.sample.name}>
                <Swatch shown={x} /> {x.sample.name}
                {k === 0 ? ' (reference)' : ''}
                {x.stale ? ' — stale' : ''}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {COMPARE_ROWS.map((row) => {
            const refV = row.get(ref.result)
            return (
              <tr key={row.label}>
                <th scope="row">
                  {row.label}
                  {row.unit && <span class="unit"> ({row.unit})</span>}
                </th>
                {p.ok.map((x, k) => {
                  const v = row.get(x.result)
                  const why = row.why?.(x.result)
                  if (why)
                    return (
                      <td key={x.id} class="withheld" data-withheld={why} title={`No value: ${why}`}>
                        <span class="value">—</span>
                        <span class="diff">{why}</span>
                      </td>
                    )
                  const text = typeof v === 'number' ? (row.show ?? num)(v) : v
                  return (
                    <td key={x.id}>
                      <span class="value">{text}</span>
                      {k > 0 && typeof v === 'number' && typeof refV === 'number' && !row.why?.(ref.result) && <span class="diff">{difference(v, refV)}</span>}
                      {k > 0 && typeof v === 'string' && v !== refV && <span class="diff">differs</span>}
                    </td>
                  )
                })}
              </tr>
            )
          })}
        </tbody>
      </table>
    </ScrollWrap>
    <Warnings items={p.ok.flatMap((x) => sampleWarnings(x.result).map((w) => `${x.sample.name}: ${w}`))} name="compare" />
    </>
  )
}

export function CompareView() {
  const s = useApp()
  if (!isComparing(s))
    return (
      <div class="view" data-view="compare">
        <p class="empty">Mark 2 to {MAX_COMPARE} samples in the list on the left (the boxes before their names) to see them side by side here and overlaid in every chart.</p>
      </div>
    )
  const shown = shownSamples(s)
  const ok = withResults(shown)
  return (
    <div class="view" data-view="compare">
      <StaleNote shown={shown} />
      {ok.length >= 1 && <CompareTable ok={ok} />}
    </div>
  )
}
