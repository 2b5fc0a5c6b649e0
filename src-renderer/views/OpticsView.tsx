// Optics by wavelength: spectra of extinction, single-scattering albedo and asymmetry parameter, the
// concentrations and Ångström exponents, and the full table per wavelength.
import { useMemo } from 'preact/hooks'
import { Chart, type Line } from '../charts/Chart.tsx'
import { lineStyle } from '../charts/palette.ts'
import { fixed, num } from '../format.ts'
import { Field } from '../edit/Field.tsx'
import { edit } from '../state/actions.ts'
import { useApp } from '../state/store.ts'
import { sampleState, shownSamples } from '../shown.ts'
import { StaleNote, withResults } from './common.tsx'
import { Warnings } from './Warnings.tsx'
import { ScrollWrap } from './ScrollWrap.tsx'
import { parseWavelengthList, type WavelengthOptics, type WithheldFigure } from '../../src-core/index.ts'

/** "350, 400, 550" (commas, semicolons or spaces; units allowed) → ascending wavelengths in nm. */
const readWavelengths = (text: string): number[] => parseWavelengthList(text, 'wavelengths', { ascending: true })

export interface TableColumn {
  head: string
  title: string
  get: (w: WavelengthOptics) => string
  /** Which withheld figure the column shows (its "—" then carries the reason). */
  withheld?: WithheldFigure
}

export const TABLE_COLUMNS: TableColumn[] = [
  { head: 'λ (nm)', title: 'Wavelength', get: (w) => num(w.wavelength_nm, 5) },
  { head: 'σext', title: 'Extinction coefficient, Mm⁻¹', get: (w) => num(w.ext) },
  { head: 'σsca', title: 'Scattering coefficient, Mm⁻¹', get: (w) => num(w.sca) },
  { head: 'σabs', title: 'Absorption coefficient, Mm⁻¹', get: (w) => num(w.abs) },
  { head: 'ω', title: 'Single-scattering albedo', get: (w) => fixed(w.ssa, 4) },
  { head: 'g', title: 'Asymmetry parameter', get: (w) => fixed(w.g, 3) },
  { head: 'b', title: 'Hemispheric backscatter fraction', get: (w) => fixed(w.backscatter_fraction, 3) },
  { head: 'β̄', title: 'Sun-averaged upscatter fraction', get: (w) => fixed(w.upscatter_fraction, 3) },
  { head: 'å', title: 'Ångström exponent of extinction at this wavelength (from the neighbouring wavelengths)', get: (w) => fixed(w.angstrom_ext, 2) },
  { head: 'å abs', title: 'Ångström exponent of absorption at this wavelength (from the neighbouring wavelengths)', get: (w) => fixed(w.angstrom_abs, 2), withheld: 'angstrom_abs' },
  { head: 'MEE', title: 'Mass extinction efficiency per dry mass, m² g⁻¹', get: (w) => num(w.mass_ext_dry, 3) },
  { head: 'MSE', title: 'Mass scattering efficiency per dry mass, m² g⁻¹', get: (w) => num(w.mass_sca_dry, 3) },
  { head: 'MAE', title: 'Mass absorption efficiency per dry mass, m² g⁻¹', get: (w) => num(w.mass_abs_dry, 3) },
  { head: 'MEE wet', title: 'Mass extinction efficiency per wet mass, m² g⁻¹', get: (w) => num(w.mass_ext_wet, 3) },
  { head: 'τ', title: 'Optical depth of the layer', get: (w) => num(w.optical_depth, 3) },
  { head: 'VR (km)', title: 'Koschmieder visual range including air, km', get: (w) => num(w.visual_range_km, 3), withheld: 'visual_range_km' },
  { head: 'dv', title: 'Haze index, deciviews', get: (w) => num(w.deciview, 3), withheld: 'deciview' }
]

/** What each symbol of the optics tables means (shown under the table, and read by the report). */
export const SYMBOLS: [string, string][] = [
  ['λ', 'wavelength, nm'],
  ['σext, σsca, σabs', 'extinction, scattering and absorption coefficients of the particles, Mm⁻¹ (per million metres)'],
  ['ω', 'single-scattering albedo σsca/σext'],
  ['g', 'asymmetry parameter (mean cosine of the scattering angle)'],
  ['b', 'hemispheric backscatter fraction (share of scattered light sent backwards, for light from straight above)'],
  ['β̄', 'upscatter fraction averaged over the sun’s angles (the share sent back to space; the forcing uses it)'],
  ['å, å abs', 'Ångström exponents of extinction and of absorption at the wavelength, −Δln σ/Δln λ from the neighbouring wavelengths'],
  ['MEE, MSE, MAE', 'mass extinction, scattering and absorption efficiencies, m² g⁻¹ of dry particle matter (“wet”: including particle water)'],
  ['τ', 'optical depth of the sample’s layer'],
  ['VR', 'visual range (Koschmieder: 3.912/(σext + air’s Rayleigh scattering)), km'],
  ['dv', 'haze index in deciviews, 10 ln((σext + air’s Rayleigh scattering)/10 Mm⁻¹)']
]

/** The reasons behind the table's "—" marks, one line each (the same reason once). */
function withheldReasons(rows: WavelengthOptics[]): string[] {
  const out = new Map<string, number[]>()
  for (const w of rows)
    for (const c of TABLE_COLUMNS) {
      const why = c.withheld && w.withheld[c.withheld]
      if (!why) continue
      const key = `${c.head}: ${why.replace(/ at \d+ nm$/, '')}`
      out.set(key, [...(out.get(key) ?? []), w.wavelength_nm])
    }
  return [...out].map(([k, wl]) => `${k} (at ${wl.join(', ')} nm)`)
}

const NICE_NM = [300, 500, 1000, 2000, 5000, 10000]

/** Range and tick labels of a log wavelength axis. */
export function wavelengthAxis(nm: number[]): { xRange: [number, number]; xTicks: number[] } {
  const lo = Math.min(...nm)
  const hi = Math.max(...nm)
  return { xRange: [lo / 1.08, hi * 1.08], xTicks: NICE_NM.filter((t) => t >= lo / 1.08 && t <= hi * 1.08) }
}

export function WavelengthTable(p: { rows: WavelengthOptics[]; caption: string }) {
  const reasons = withheldReasons(p.rows)
  return (
    <div class="table-block">
      <ScrollWrap label={p.caption}>
        <table class="grid-table numbers optics-table" data-testid="optics-table">
          <caption>{p.caption}</caption>
          <thead>
            <tr>
              {TABLE_COLUMNS.map((c) => (
                <th scope="col" title={c.title} key={c.head}>
                  {c.head}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {p.rows.map((w) => (
              <tr key={w.wavelength_nm} data-wavelength={w.wavelength_nm}>
                {TABLE_COLUMNS.map((c, k) => {
                  if (k === 0) return <th scope="row" key={c.head}>{c.get(w)}</th>
                  const why = c.withheld && w.withheld[c.withheld]
                  return why ? (
                    <td key={c.head} data-col={c.head} data-withheld={why} title={`No value: ${why}`} class="withheld">
                      —
                    </td>
                  ) : (
                    <td key={c.head} data-col={c.head}>
                      {c.get(w)}
                    </td>
                  )
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollWrap>
      {reasons.length > 0 && (
        <ul class="table-note withheld-notes" data-testid="withheld-notes">
          {reasons.map((r) => (
            <li key={r}>— {r}</li>
          ))}
        </ul>
      )}
      <p class="table-note">Coefficients in Mm⁻¹; mass efficiencies in m² g⁻¹ (MEE/MSE/MAE per dry mass); visual range and deciviews include clean air's Rayleigh scattering.</p>
      <SymbolLegend />
    </div>
  )
}

export function SymbolLegend() {
  return (
    <details class="symbol-legend" data-testid="symbol-legend" open>
      <summary>Symbols</summary>
      <dl>
        {SYMBOLS.map(([sym, text]) => (
          <div key={sym}>
            <dt>{sym}</dt>
            <dd>{text}</dd>
          </div>
        ))}
      </dl>
    </details>
  )
}

export function OpticsView() {
  const s = useApp()
  const shown = shownSamples(s)
  const ok = withResults(shown)
  const comparing = ok.length >= 2
  const sel = sampleState(s, s.selected)
  const key = ok.map((x) => x.result).concat() as unknown[]

  const ext = useMemo(() => {
    if (!ok.length) return null
    const wl = ok[0].result.optics.wavelengths.map((w) => w.wavelength_nm)
    if (comparing) {
      return {
        data: [wl, ...ok.map((x) => x.result.optics.wavelengths.map((w) => w.ext))],
        lines: ok.map((x): Line => ({ label: `${x.sample.name} σext`, stroke: x.style.stroke, dash: x.style.dash }))
      }
    }
    const r = ok[0].result.optics.wavelengths
    return {
      data: [wl, r.map((w) => w.ext), r.map((w) => w.sca), r.map((w) => w.abs)],
      lines: ['σext', 'σsca', 'σabs'].map((label, k): Line => ({ label, stroke: lineStyle(k, s.theme).stroke, dash: lineStyle(k, s.theme).dash }))
    }
  }, [...key, s.theme, comparing])

  const per = (f: (w: WavelengthOptics) => number, what: string) => {
    if (!ok.length) return null
    const wl = ok[0].result.optics.wavelengths.map((w) => w.wavelength_nm)
    return {
      data: [wl, ...ok.map((x) => x.result.optics.wavelengths.map(f))],
      lines: ok.map((x): Line => ({ label: comparing ? x.sample.name : what, stroke: x.style.stroke, dash: x.style.dash }))
    }
  }
  const ssa = useMemo(() => per((w) => w.ssa, 'ω'), [...key, s.theme])
  const g = useMemo(() => per((w) => w.g, 'g'), [...key, s.theme])
  const stale = shown.some((x) => x.stale)
  const o = sel?.result?.optics
  const axis = wavelengthAxis(ok[0]?.result.optics.wavelengths.map((w) => w.wavelength_nm) ?? [550])
  // The table is the view's largest piece: the same element is given back while its rows and caption stand,
  // so other updates (progress, the size plot) do not redraw it.
  const caption = sel ? `${sel.sample.name}: optics at each wavelength${sel.stale ? ' (stale)' : ''}` : ''
  const table = useMemo(() => (o ? <WavelengthTable rows={o.wavelengths} caption={caption} /> : null), [o?.wavelengths, caption])

  return (
    <div class="view optics-view" data-view="optics">
      <StaleNote shown={shown} />
      <div class="row wrap">
        <Field
          path="wavelengths_nm"
          label="Wavelengths"
          value={s.study.wavelengths_nm}
          read={readWavelengths}
          write={(v) => v.join(', ')}
          hint="nm, ascending (used by every sample and by the spectral forcing)"
          commit={(v) => edit((st) => (st.wavelengths_nm = v), 'wavelengths')}
        />
      </div>
      {o && sel && (
        <dl class="facts" data-testid="optics-facts">
          <div>
            <dt>N</dt>
            <dd>{num(o.number_cm3)} cm⁻³</dd>
          </div>
          <div>
            <dt>Dry mass</dt>
            <dd>{num(o.mass_ug_m3)} µg m⁻³</dd>
          </div>
          <div>
            <dt>PM2.5 / PM10</dt>
            <dd>
              {num(o.pm2_5_ug_m3, 3)} / {num(o.pm10_ug_m3, 3)} µg m⁻³
            </dd>
          </div>
          <div>
            <dt>Wet / dry volume</dt>
            <dd>{num(o.wet_volume_um3_cm3 / o.volume_um3_cm3, 3)}</dd>
          </div>
          <div>
            <dt title="Ångström exponents fitted over all wavelengths">Ångström å ext / sca / abs</dt>
            <dd>
              {fixed(o.angstrom_fit.ext, 2)} / {fixed(o.angstrom_fit.sca, 2)} /{' '}
              {o.angstrom_fit.withheld?.abs ? (
                <span class="withheld" data-testid="fit-abs" data-withheld={o.angstrom_fit.withheld.abs} title={`No value: ${o.angstrom_fit.withheld.abs}`}>
                  — <span class="why">({o.angstrom_fit.withheld.abs})</span>
                </span>
              ) : (
                <span data-testid="fit-abs">{fixed(o.angstrom_fit.abs, 2)}</span>
              )}
            </dd>
          </div>
        </dl>
      )}
      {ext && ssa && g && (
        <div class="chart-grid three">
          <Chart name="extinction-spectrum" title={comparing ? 'Extinction spectra' : 'Extinction, scattering, absorption'} data={ext.data} lines={ext.lines} xLabel="Wavelength (nm)" yLabel="Mm⁻¹" xLog yLog {...axis} theme={s.theme} stale={stale} height={200} />
          <Chart name="ssa-spectrum" title="Single-scattering albedo ω" data={ssa.data} lines={ssa.lines} xLabel="Wavelength (nm)" yLabel="ω" xLog {...axis} theme={s.theme} stale={stale} height={200} />
          <Chart name="g-spectrum" title="Asymmetry parameter g" data={g.data} lines={g.lines} xLabel="Wavelength (nm)" yLabel="g" xLog {...axis} theme={s.theme} stale={stale} height={200} />
        </div>
      )}
      {o && <Warnings items={o.warnings} name="optics" />}
      {sel && table}
      {o && o.notes.length > 0 && (
        <ul class="notes">
          {o.notes.map((n, k) => (
            <li key={k}>{n}</li>
          ))}
        </ul>
      )}
    </div>
  )
}
