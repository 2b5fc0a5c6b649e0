// Warming or cooling: the site, the verdict in plain words with its numbers, the forcing map over surface
// albedo and ω, and the thin-layer and two-stream estimates side by side.
import { DEFAULT_VERDICT_MARGIN_WM2, SURFACE_TYPES, siteLongwaveDefaults, type SampleForcing, type Site } from '../../src-core/index.ts'
import { ESTIMATE_CAUTION } from '../cautions.ts'
import { ForcingMapChart } from './ForcingMapChart.tsx'
import { Field, readFraction, readNumber } from '../edit/Field.tsx'
import { fixed, num, signed } from '../format.ts'
import { edit } from '../state/actions.ts'
import { useApp } from '../state/store.ts'
import { sampleState, shownSamples, type ShownSample } from '../shown.ts'
import { StaleNote, Swatch, withResults } from './common.tsx'
import { Warnings } from './Warnings.tsx'

const siteEdit = (f: (s: Site) => void, key?: string) => edit((st) => f(st.site), key && `site.${key}`)

function SiteForm() {
  const s = useApp()
  const site = s.study.site
  const margin = s.study.verdict_margin_w_m2 ?? DEFAULT_VERDICT_MARGIN_WM2
  const surface = SURFACE_TYPES.find((t) => t.id === site.surface)
  return (
    <fieldset class="site">
      <legend>Site</legend>
      <label class="field">
        <span>Surface</span>
        <select
          value={site.surface}
          data-testid="surface"
          data-path="site.surface"
          onChange={(e) => {
            const v = (e.target as HTMLSelectElement).value
            siteEdit((x) => {
              x.surface = v
              if (v === 'custom') x.surface_albedo = x.surface_albedo ?? surface?.albedo ?? 0.2
              else delete x.surface_albedo
            })
          }}
        >
          {SURFACE_TYPES.map((t) => (
            <option key={t.id} value={t.id}>
              {t.name} ({t.albedo})
            </option>
          ))}
          <option value="custom">Custom albedo…</option>
        </select>
      </label>
      {site.surface === 'custom' && (
        <Field path="site.surface_albedo" label="Surface albedo" value={site.surface_albedo ?? 0.2} read={readFraction('surface albedo')} write={(v) => num(v, 3)} hint="0–1" width="4em" commit={(v) => siteEdit((x) => (x.surface_albedo = v), 'albedo')} />
      )}
      <div class="row wrap">
        <Field path="site.latitude_deg" label="Latitude" value={site.latitude_deg} read={readNumber('latitude')} write={(v) => num(v, 5)} hint="° N (south < 0)" width="4em" commit={(v) => siteEdit((x) => (x.latitude_deg = v), 'lat')} />
        <Field path="site.day_of_year" label="Day of year" value={site.day_of_year} read={readNumber('day of year')} write={(v) => String(v)} hint="1–366" width="3.5em" commit={(v) => siteEdit((x) => (x.day_of_year = v), 'day')} />
        <Field path="site.cloud_fraction" label="Cloud fraction" value={site.cloud_fraction} read={readFraction('cloud fraction')} write={(v) => num(v, 3)} hint="0–1" width="3.5em" commit={(v) => siteEdit((x) => (x.cloud_fraction = v), 'cloud')} />
        <Field path="site.transmittance" label="Transmittance above" value={site.transmittance} read={readFraction('transmittance')} write={(v) => num(v, 3)} hint="0–1" width="3.5em" commit={(v) => siteEdit((x) => (x.transmittance = v), 'trans')} />
        <Field
          path="verdict_margin_w_m2"
          label="Too close to call within"
          value={margin}
          read={readNumber('verdict margin')}
          write={(v) => num(v, 3)}
          hint="W m⁻²"
          width="3.5em"
          title="Below this |ΔF| the verdict is “too close to call”"
          commit={(v) => edit((st) => (st.verdict_margin_w_m2 = v), 'margin')}
        />
      </div>
      <InfraredSiteFields site={site} />
    </fieldset>
  )
}

/** The site's thermal-infrared inputs; each shows its default (the surface type's emissivity) until it is changed. */
function InfraredSiteFields(p: { site: Site }) {
  const site = p.site
  const d = siteLongwaveDefaults(site)
  return (
    <div class="row wrap infrared-site" data-testid="infrared-site">
      <Field path="site.surface_temperature_k" label="Surface temperature" value={site.surface_temperature_k ?? d.surfaceTemperatureK} read={readNumber('surface temperature')} write={(v) => num(v, 5)} hint="K" width="4.8em" title="Surface (skin) temperature, 180–350 K; default 288.15 K" commit={(v) => siteEdit((x) => (x.surface_temperature_k = v), 'ts')} />
      <Field path="site.surface_emissivity" label="Infrared emissivity" value={site.surface_emissivity ?? d.surfaceEmissivity} read={readFraction('surface emissivity')} write={(v) => num(v, 3)} hint="0.5–1" width="3.5em" title="Broadband thermal-infrared emissivity of the surface; default the surface type's (Oke 1987, Table 1.1), and for desert sand its emissivity by band (quartz's dip at 8–10 µm) unless a value is given here, which is taken as grey" commit={(v) => siteEdit((x) => (x.surface_emissivity = v), 'emis')} />
      <Field path="site.layer_height_km" label="Layer height" value={site.layer_height_km ?? d.layerHeightKm} read={readNumber('layer height')} write={(v) => num(v, 4)} hint="km (middle)" width="3.5em" title="Height of the layer's middle above the ground, 0–15 km; its temperature follows 6.5 K/km" commit={(v) => siteEdit((x) => (x.layer_height_km = v), 'height')} />
      <Field path="site.water_column_cm" label="Water vapour" value={site.water_column_cm ?? d.waterColumnCm} read={readNumber('water-vapour column')} write={(v) => num(v, 3)} hint="cm precipitable" width="3.5em" title="Precipitable water of the column, 0–10 cm; default 2.5 cm" commit={(v) => siteEdit((x) => (x.water_column_cm = v), 'water')} />
    </div>
  )
}

const VERDICT_HEAD: Record<SampleForcing['verdict'], string> = {
  cools: 'This layer cools',
  warms: 'This layer warms',
  'too close to call': 'Too close to call'
}

export function Verdict(p: { x: ShownSample & { result: NonNullable<ShownSample['result']> }; compact?: boolean }) {
  const f = p.x.result.forcing
  return (
    <section class={`verdict v-${f.verdict.replace(/ /g, '-')}${p.x.stale ? ' is-stale' : ''}${p.compact ? ' compact' : ''}`} data-testid="verdict" data-verdict={f.verdict} aria-live="polite">
      <h3>
        {p.compact && <Swatch shown={p.x} />} {p.compact ? `${p.x.sample.name}: ` : ''}
        <span class="verdict-word">{VERDICT_HEAD[f.verdict]}</span>
        {p.x.stale && <span class="stale-tag">stale</span>}
      </h3>
      <p class="explanation">{f.explanation}</p>
      <Warnings items={f.warnings} name="forcing" />
      <VerdictBasis f={f} />
      <dl class="facts">
        <div>
          <dt>{p.compact ? 'net' : 'Net, sunlight + infrared'}</dt>
          <dd data-testid="net-forcing">{signed(f.net_toa_w_m2)} W m⁻²</dd>
        </div>
        <div>
          <dt>{p.compact ? 'sunlight' : 'Sunlight part, thin layer (S₀/4)'}</dt>
          <dd data-testid="forcing">{signed(f.thin_layer_w_m2)} W m⁻²</dd>
        </div>
        <div>
          <dt>{p.compact ? 'infrared' : 'Infrared part, top / surface'}</dt>
          <dd data-testid="longwave-forcing" title={f.longwave_withheld ?? undefined}>
            {f.longwave_toa_w_m2 === null ? 'left out' : `${signed(f.longwave_toa_w_m2)} / ${signed(f.longwave_surface_w_m2)} W m⁻²`}
          </dd>
        </div>
        <div>
          <dt>{p.compact ? 'per τ' : 'Efficiency'}</dt>
          <dd>{signed(f.efficiency_w_m2_per_tau)} W m⁻² per unit τ</dd>
        </div>
        <div>
          <dt>{p.compact ? 'ω vs ω_crit' : 'ω at 550 nm vs ω_crit'}</dt>
          <dd data-testid="ssa-vs-crit">
            {fixed(f.ssa_550, 3)} {f.ssa_550 > f.critical_ssa ? '>' : f.ssa_550 < f.critical_ssa ? '<' : '='} {fixed(f.critical_ssa, 3)}
          </dd>
        </div>
        <div>
          <dt>{p.compact ? 'flips at Rs' : 'Sign flips at surface albedo'}</dt>
          <dd data-testid="flip-albedo">{f.flip_surface_albedo === null ? 'never (0–1)' : fixed(f.flip_surface_albedo, 3)}</dd>
        </div>
        <div>
          <dt>{p.compact ? 'τ₅₅₀, Rs' : 'τ₅₅₀, surface albedo'}</dt>
          <dd>
            {num(f.tau_550, 3)}, {fixed(f.surface_albedo, 2)}
          </dd>
        </div>
      </dl>
    </section>
  )
}

/**
 * Which figure the verdict rests on, beside the others that can differ in sign: the verdict (and the sample list's
 * word) is the thin-layer global mean; the site's daily mean is the same layer under one day's sun at one latitude.
 */
export function VerdictBasis(p: { f: SampleForcing }) {
  const f = p.f
  const differs = Math.sign(f.daily_mean_w_m2) !== Math.sign(f.thin_layer_w_m2) && Math.abs(f.daily_mean_w_m2) > f.margin_w_m2
  return (
    <p class="verdict-basis" data-testid="verdict-basis">
      The verdict (also in the sample list) rests on the net forcing, {signed(f.net_toa_w_m2)} W m⁻²
      {f.verdict === 'too close to call' ? `, within the ±${num(f.margin_w_m2, 3)} W m⁻² margin` : ''}: the thin-layer forcing with global-mean sunlight, {signed(f.thin_layer_w_m2)} W m⁻² (on its own it {f.sunlight_verdict === 'too close to call' ? 'is too close to call' : f.sunlight_verdict}),
      {f.longwave_toa_w_m2 === null ? ` with the infrared part left out (${f.longwave_withheld ?? ''})` : ` plus the thermal-infrared part at the top of the atmosphere, ${signed(f.longwave_toa_w_m2)} W m⁻²; the ${f.dominant} part dominates`}. The daily mean at the site, {signed(f.daily_mean_w_m2)} W m⁻², is the same layer under
      this latitude’s and day’s sun{differs ? ': here it has the other sign, so read it for this site and season, the verdict for the layer in general' : ''}.
    </p>
  )
}

export function MethodsTable(p: { ok: (ShownSample & { result: NonNullable<ShownSample['result']> })[] }) {
  const rows: [string, string, (f: SampleForcing) => number][] = [
    ['Thin layer, global mean (Chylek & Wong): the verdict’s sunlight part', 'S₀/4, top of atmosphere', (f) => f.thin_layer_w_m2],
    ['Thin layer, solar-spectrum weighted', 'S₀/4, top of atmosphere', (f) => f.spectral_w_m2],
    ['Thin layer, daily mean at the site', 'site latitude and day', (f) => f.daily_mean_w_m2],
    ['Two-stream (δ-Eddington), top of atmosphere', 'μ₀ = 0.5, S₀/4', (f) => f.two_stream.toa_w_m2],
    ['Two-stream, at the surface', 'μ₀ = 0.5, S₀/4', (f) => f.two_stream.surface_w_m2],
    ['Two-stream, absorbed in the atmosphere', 'μ₀ = 0.5, S₀/4', (f) => f.two_stream.atmosphere_w_m2],
    ['Infrared (two-stream with emission), top of atmosphere', '4–40 µm, site temperatures', (f) => f.longwave_toa_w_m2 ?? NaN],
    ['Infrared, at the surface', '4–40 µm, site temperatures', (f) => f.longwave_surface_w_m2 ?? NaN],
    ['Net: thin-layer sunlight + infrared, top of atmosphere: the verdict’s figure', 'global mean', (f) => f.net_toa_w_m2]
  ]
  return (
    <table class="grid-table numbers methods" data-testid="methods-table">
      <caption>
        Sunlight (thin-layer and two-stream) and thermal-infrared estimates (W m⁻²; negative = cooling). Both methods take the sample’s upscatter fraction β̄ at 550 nm
        {p.ok.length === 1 ? ` (${fixed(p.ok[0].result.forcing.upscatter_550, 3)})` : ''}, the two-stream layer also its g, so they differ only by what the thin form leaves out.
      </caption>
      <thead>
        <tr>
          <th scope="col">Method</th>
          <th scope="col">Basis</th>
          {p.ok.map((x) => (
            <th scope="col" key={x.id}>
              {p.ok.length > 1 && <Swatch shown={x} />} {x.sample.name}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {rows.map(([name, basis, f]) => (
          <tr key={name}>
            <th scope="row">{name}</th>
            <td class="text">{basis}</td>
            {p.ok.map((x) => (
              <td key={x.id}>{signed(f(x.result.forcing))}</td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  )
}

export { ForcingMapChart } from './ForcingMapChart.tsx'

export function ClimateView() {
  const s = useApp()
  const shown = shownSamples(s)
  const ok = withResults(shown)
  const sel = sampleState(s, s.selected)
  const stale = shown.some((x) => x.stale)
  const verdicts = ok.length > 1 ? ok : ok.filter((x) => x.id === sel?.id)
  return (
    <div class="view climate-view" data-view="climate">
      <StaleNote shown={shown} />
      <div class="climate-grid">
        <div class="climate-left">
          <SiteForm />
          {verdicts.map((x) => (
            <Verdict key={x.id} x={x} compact={ok.length > 1} />
          ))}
        </div>
        <div class="climate-right">
          <ForcingMapChart ok={ok} theme={s.theme} stale={stale} />
        </div>
      </div>
      {ok.length > 0 && <MethodsTable ok={ok} />}
      <p class="caution-line" role="note">
        ⚠ {ESTIMATE_CAUTION}
      </p>
    </div>
  )
}
