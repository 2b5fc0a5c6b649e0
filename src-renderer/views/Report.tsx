// The report: the study, its own components, each sample's inputs written out in full (modes or bins, main and
// per-mode compositions; see ReportInputs.tsx) and results, charts, verdict, cautions, method references and the
// software version, laid out for print (browser: print dialog; desktop: PDF).
import { useEffect, useMemo } from 'preact/hooks'
import { DEFAULT_VERDICT_MARGIN_WM2, LONGWAVE_METHOD, siteEmissivityBands, siteLongwaveDefaults, SURFACE_TYPES, type Sample } from '../../src-core/index.ts'
import { Chart, type Line } from '../charts/Chart.tsx'
import { lineStyle } from '../charts/palette.ts'
import { printReport } from '../commands.ts'
import { APP_VERSION } from '../exports.ts'
import { isoDateTime, num } from '../format.ts'
import { host } from '../host/index.ts'
import { store, useApp } from '../state/store.ts'
import { sampleState } from '../shown.ts'
import { CautionText } from './Cautions.tsx'
import { ForcingMapChart, MethodsTable, Verdict } from './ClimateView.tsx'
import { BinsSummary, CompositionText, mainCompositionUse, ModesList, OwnComponentsReport, ownComponentStates, type OwnComponentState } from './ReportInputs.tsx'
import { wavelengthAxis, WavelengthTable } from './OpticsView.tsx'
import { Warnings } from './Warnings.tsx'

export const REFERENCES = [
  'Bohren, C. F. and Huffman, D. R. (1983): Absorption and Scattering of Light by Small Particles. Wiley. (Mie theory, coated spheres.)',
  'Wiscombe, W. J. (1980): Improved Mie scattering algorithms. Applied Optics 19, 1505–1509.',
  'Hatch, T. and Choate, S. P. (1929): Statistical description of the size properties of non-uniform particulate substances. J. Franklin Inst. 207, 369–387.',
  'Petters, M. D. and Kreidenweis, S. M. (2007): A single parameter representation of hygroscopic growth and CCN activity. Atmos. Chem. Phys. 7, 1961–1971.',
  'Chylek, P. and Wong, J. (1995): Effect of absorbing aerosols on global radiation budget. Geophys. Res. Lett. 22, 929–931.',
  'Wiscombe, W. J. and Grams, G. W. (1976): The backscattered fraction in two-stream approximations. J. Atmos. Sci. 33, 2440–2451.',
  'Joseph, J. H., Wiscombe, W. J. and Weinman, J. A. (1976): The delta-Eddington approximation for radiative flux transfer. J. Atmos. Sci. 33, 2452–2459.',
  'Coakley, J. A. and Chýlek, P. (1975): The two-stream approximation in radiative transfer: including the angle of the incident radiation. J. Atmos. Sci. 32, 409–418. (The two-stream layer takes the population’s own upscatter fraction.)',
  'Toon, O. B., McKay, C. P., Ackerman, T. P. and Santhanam, K. (1989): Rapid calculation of radiative heating rates and photodissociation rates in inhomogeneous multiple scattering atmospheres. J. Geophys. Res. 94(D13), 16287–16301. (The thermal-infrared two-stream with emission.)',
  'Widger, W. K. and Woodall, M. P. (1976): Integration of the Planck blackbody radiation function. Bull. Am. Meteorol. Soc. 57, 1217–1219.',
  'Oke, T. R. (1987): Boundary Layer Climates, 2nd ed. Routledge. (Surface albedos and emissivities.)',
  'Seinfeld, J. H. and Pandis, S. N. (2016): Atmospheric Chemistry and Physics, 3rd ed. Wiley. (Size distributions, visibility.)'
]

function describeLayer(s: Sample): string {
  const l = s.layer
  return l.kind === 'depth' ? `uniform, ${num(l.depth_m, 8)} m deep` : l.kind === 'scale-height' ? `exponential, scale height ${num(l.scale_height_m, 8)} m` : `scaled to an AOD at 550 nm of ${num(l.aod_550, 8)}`
}

function SampleSection(p: { id: string; own: OwnComponentState[] }) {
  const s = { ...useApp(), theme: 'light' as const } // the report is always in the light (print) theme
  const x = sampleState(s, p.id)
  if (!x) return null
  const smp = x.sample
  const r = x.result
  const ok = r ? [{ ...x, result: r }] : []
  const wl = r?.optics.wavelengths.map((w) => w.wavelength_nm) ?? []
  const specLines: Line[] = ['σext', 'σsca', 'σabs'].map((label, k) => ({ label, stroke: lineStyle(k, s.theme).stroke, dash: lineStyle(k, s.theme).dash }))
  return (
    <section class="report-sample" data-report-sample={smp.name}>
      <h2>
        {x.index + 1}. {smp.name}
      </h2>
      {smp.notes && <p class="notes-text">{smp.notes}</p>}
      <table class="grid-table report-inputs">
        <tbody>
          <tr>
            <th scope="row">Size distribution</th>
            <td>{smp.size.kind === 'bins' ? <BinsSummary bins={smp.size.bins} /> : <ModesList modes={smp.size.modes} />}</td>
          </tr>
          <tr data-report-composition="main">
            <th scope="row">Main composition</th>
            <td>
              <CompositionText composition={smp.composition} own={p.own} where={`sample '${smp.name}'`} />
              <div class="detail">{mainCompositionUse(smp.size)}</div>
            </td>
          </tr>
          {smp.size.kind === 'modes' &&
            smp.size.modes.map(
              (m, j) =>
                m.composition && (
                  <tr key={j} data-report-composition={`mode-${j}`}>
                    <th scope="row">
                      Composition of mode {j + 1}{' '}
                      {m.name && <div class="detail">{m.name}</div>}
                    </th>
                    <td>
                      <CompositionText composition={m.composition} own={p.own} where={`sample '${smp.name}', mode ${j + 1}`} />
                    </td>
                  </tr>
                )
            )}
          <tr>
            <th scope="row">Humidity</th>
            <td>
              {num(smp.rh_percent, 8)} % RH, {smp.rh_history} branch (particles were {smp.rh_history === 'rising' ? 'dry' : 'wet'} before);{' '}
              {smp.temperature_k !== undefined ? `${num(smp.temperature_k, 8)} K` : 'temperature not given (the Kelvin term takes 298.15 K)'}
            </td>
          </tr>
          <tr>
            <th scope="row">Layer</th>
            <td>{describeLayer(smp)}</td>
          </tr>
        </tbody>
      </table>
      {!r ? (
        <p class="stale-note">No results: the inputs of this sample have problems.</p>
      ) : (
        <>
          {!x.current && <p class="stale-note">These results are stale (from earlier inputs).</p>}
          {x.preview && <p class="stale-note">These figures are from the quick first pass (to about 1 % of σext); the full computation was still running when this report was made.</p>}
          <Verdict x={{ ...x, result: r }} />
          <div class="report-charts">
            <Chart name={`report-ext-${x.index}`} title="Extinction, scattering, absorption" data={[wl, r.optics.wavelengths.map((w) => w.ext), r.optics.wavelengths.map((w) => w.sca), r.optics.wavelengths.map((w) => w.abs)]} lines={specLines} xLabel="Wavelength (nm)" yLabel="Mm⁻¹" xLog yLog {...wavelengthAxis(wl.length ? wl : [550])} theme={s.theme} height={190} />
            <Chart name={`report-ssa-${x.index}`} title="ω and g" data={[wl, r.optics.wavelengths.map((w) => w.ssa), r.optics.wavelengths.map((w) => w.g)]} lines={[{ label: 'ω', ...lineStyle(0, s.theme) }, { label: 'g', ...lineStyle(1, s.theme) }]} xLabel="Wavelength (nm)" yLabel="ω and g (no unit)" xLog {...wavelengthAxis(wl.length ? wl : [550])} theme={s.theme} height={190} />
            <ForcingMapChart ok={ok} theme={s.theme} stale={!x.current} height={190} />
            <ReportSizeChart id={p.id} index={x.index} />
          </div>
          <Warnings items={r.optics.warnings} name="optics" />
          <WavelengthTable rows={r.optics.wavelengths} caption="Optics at each wavelength" />
          <MethodsTable ok={ok} />
        </>
      )}
    </section>
  )
}

/** The sample's dry number size distribution (as in the workbench's size plot; measured bins drawn as steps). */
function ReportSizeChart(p: { id: string; index: number }) {
  const c = useApp().sizes[p.id]
  if (!c || 'error' in c) return <p class="empty">No size distribution to draw{c ? `: ${c.error}` : ''}.</p>
  return (
    <Chart
      name={`report-size-${p.index}`}
      title="Size distribution (dry)"
      data={[c.diameter_um, c.number]}
      lines={[{ label: 'dN/dlogDp', ...lineStyle(0, 'light'), steps: c.measured }]}
      xLabel="Dry diameter Dp (µm)"
      yLabel="dN/dlogDp (cm⁻³)"
      xLog
      xRange={[0.001, 100]}
      theme="light"
      height={190}
    />
  )
}

export function Report() {
  const s = useApp()
  const st = s.study
  const surface = SURFACE_TYPES.find((t) => t.id === st.site.surface)
  const lw = siteLongwaveDefaults(st.site)
  const own = useMemo(() => ownComponentStates(st), [st])
  useEffect(() => {
    document.documentElement.classList.add('printing-report')
    return () => document.documentElement.classList.remove('printing-report')
  }, [])
  return (
    <div class="report-page" data-theme="light" data-testid="report">
      <div class="report-toolbar no-print">
        <button type="button" class="primary" onClick={() => void printReport()} data-testid="print-report">
          {host().kind === 'desktop' ? 'Save as PDF…' : 'Print…'}
        </button>
        <button type="button" onClick={() => store().set({ reportOpen: false })} data-testid="close-report">
          Back to the study
        </button>
      </div>
      <article class="report">
        <header>
          <h1>{st.name}</h1>
          <p class="meta">
            Motebench {APP_VERSION} · report made <time data-testid="report-date" dateTime={new Date().toISOString()}>{isoDateTime(new Date())}</time> · {st.samples.length} sample{st.samples.length === 1 ? '' : 's'}
            {s.file ? ` · file ${s.file.name}` : ''}
          </p>
          {st.notes && <p class="notes-text">{st.notes}</p>}
          <p>
            Site: {st.site.name ?? 'unnamed'}; latitude {num(st.site.latitude_deg)}°, day {st.site.day_of_year}, cloud fraction {num(st.site.cloud_fraction)}, transmittance {num(st.site.transmittance)}, surface{' '}
            {st.site.surface === 'custom' ? `custom albedo ${num(st.site.surface_albedo ?? NaN)}` : `${surface?.name ?? st.site.surface} (albedo ${surface?.albedo})`}; thermal infrared: surface temperature {num(lw.surfaceTemperatureK, 5)} K,
            emissivity {num(lw.surfaceEmissivity, 3)}{siteEmissivityBands(st.site) ? ` (taken by band from the surface type: ${siteEmissivityBands(st.site)!.map((e) => num(e, 2)).join(', ')} over the 12 bands from 4 to 40 µm)` : ''}, layer centred at {num(lw.layerHeightKm, 4)} km, water-vapour column {num(lw.waterColumnCm, 3)} cm{st.site.surface_temperature_k === undefined || st.site.water_column_cm === undefined || st.site.layer_height_km === undefined || st.site.surface_emissivity === undefined ? ' (defaults where not given)' : ''}. Verdict “too close to call” within ±{num(st.verdict_margin_w_m2 ?? DEFAULT_VERDICT_MARGIN_WM2, 8)} W m⁻². Wavelengths: {st.wavelengths_nm.join(', ')} nm.
          </p>
        </header>
        <section class="report-cautions">
          <h2>Cautions</h2>
          <CautionText />
        </section>
        <OwnComponentsReport study={st} own={own} />
        {s.ids.map((id) => (
          <SampleSection id={id} key={id} own={own} />
        ))}
        <section class="report-references">
          <h2>Methods and references</h2>
          <p>
            Particle optics by Mie theory for homogeneous and coated spheres over the size distribution; water uptake by κ-Köhler theory; refractive indices of mixtures by the
            rule named for each sample; forcing of a uniform layer by the thin-layer estimate and a δ-Eddington two-stream layer over a Lambertian surface.
          </p>
          <p data-testid="report-longwave-method">
            {LONGWAVE_METHOD} The layer’s infrared optics are the same size integration at 20 wavelengths from 4 to 40 µm, averaged over 12 bands. The verdict rests on the net: the
            thin-layer sunlight figure plus the infrared figure at the top of the atmosphere. Assumptions and limits: the gases’ band transmittances are stated, rough screening values
            (the weakest part); the lapse rate, tropopause and water-vapour profile are fixed; the layer’s infrared indices of ammonium sulfate, ammonium nitrate, sulfuric acid and black carbon
            are recalled from published tables (from memory); organic matter and brown carbon take, beyond 2.5 µm, the bands of liquid ethylene glycol (Sani and Dell’Oro
            2014, Optical Materials 37, 36–41), a stand-in for organic aerosol that has its C–O bands in the 8–13 µm window but no carbonyl band.
          </p>
          <ol>
            {REFERENCES.map((r, k) => (
              <li key={k}>{r}</li>
            ))}
          </ol>
          <p class="meta">Produced with Motebench {APP_VERSION}.</p>
        </section>
      </article>
    </div>
  )
}
