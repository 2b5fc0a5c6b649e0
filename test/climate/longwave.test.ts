import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import {
  InputError,
  LONGWAVE_BANDS,
  STEFAN_BOLTZMANN_WM2K4,
  airTemperatureK,
  blackbodyFractionBelow,
  forcingMap,
  thinLayerForcing,
  longwaveForcing,
  netVerdict,
  planckBandFlux,
  planckBandFluxes,
  thermalTwoStream,
  type ThermalLayer
} from '../../src-core/index.ts'

interface PlanckCase {
  lo_um: number
  hi_um: number | null
  t_k: number
  flux_w_m2: number
}
// mpmath.quad at 30 digits, checked against scipy.integrate.quad (test/reference/make_planck_reference.py)
const planckRef: PlanckCase[] = JSON.parse(readFileSync(new URL('../reference/planck-bands.json', import.meta.url), 'utf8')).cases

const grey = (tau: number, omega = 0, g = 0) => LONGWAVE_BANDS.map(() => ({ tau, omega, g }))
const site = { surfaceTemperatureK: 288.15, surfaceEmissivity: 0.95, layerHeightKm: 3, layerDepthKm: 2, waterColumnCm: 2.5, cloudFraction: 0 }

describe('Planck band integrals', () => {
  it('band fluxes π∫B_λ dλ match mpmath/scipy quadrature to 1e-10 (test/reference/make_planck_reference.py)', () => {
    expect(planckRef.length).toBeGreaterThan(80)
    for (const c of planckRef) {
      const v = planckBandFlux(c.lo_um, c.hi_um ?? Number.POSITIVE_INFINITY, c.t_k)
      expect(Math.abs(v - c.flux_w_m2)).toBeLessThanOrEqual(1e-10 * c.flux_w_m2 + 1e-300)
    }
  })
  it('the fluxes of contiguous bands from their shared edges (planckBandFluxes, as the infrared forcing takes them) match the same quadrature to 1e-10', () => {
    const edges = [LONGWAVE_BANDS[0].loUm, ...LONGWAVE_BANDS.map((b) => b.hiUm)]
    let compared = 0
    for (const t of [...new Set(planckRef.map((c) => c.t_k))]) {
      const out = planckBandFluxes(edges, t, new Float64Array(LONGWAVE_BANDS.length))
      LONGWAVE_BANDS.forEach((b, i) => {
        const ref = planckRef.find((c) => c.t_k === t && c.lo_um === b.loUm && c.hi_um === b.hiUm)
        if (!ref) return
        expect(Math.abs(out[i] - ref.flux_w_m2)).toBeLessThanOrEqual(1e-10 * ref.flux_w_m2 + 1e-300)
        compared++
      })
    }
    expect(compared).toBeGreaterThanOrEqual(LONGWAVE_BANDS.length * 4)
  })
  it('the bands with the stretches below 4 µm and beyond 40 µm add up to σT⁴ (Stefan–Boltzmann, CODATA 2018 σ), from the reference integrals and from the code', () => {
    for (const t of [180, 220, 255, 288.15, 310, 350]) {
      const ref = planckRef.filter((c) => c.t_k === t && c.lo_um !== 8).reduce((a, c) => a + c.flux_w_m2, 0)
      // below 0.1 µm a 350 K body emits e^{-411} of its energy: nothing
      expect(Math.abs(ref / (STEFAN_BOLTZMANN_WM2K4 * t ** 4) - 1)).toBeLessThan(1e-9)
      let sum = planckBandFlux(1e-3, LONGWAVE_BANDS[0].loUm, t) + planckBandFlux(40, Number.POSITIVE_INFINITY, t)
      for (const b of LONGWAVE_BANDS) sum += planckBandFlux(b.loUm, b.hiUm, t)
      expect(Math.abs(sum / (STEFAN_BOLTZMANN_WM2K4 * t ** 4) - 1)).toBeLessThan(1e-12)
    }
  })
  it('the fraction below λ depends on λT alone, and runs from 0 to 1', () => {
    expect(blackbodyFractionBelow(10, 300)).toBeCloseTo(blackbodyFractionBelow(20, 150), 14)
    expect(blackbodyFractionBelow(0.05, 300)).toBe(0)
    expect(blackbodyFractionBelow(Number.POSITIVE_INFINITY, 300)).toBe(1)
  })
})

describe('thermal two-stream (hemispheric mean, Toon et al. 1989)', () => {
  const layer = (tau: number, omega: number, g: number, top: number, bottom: number): ThermalLayer => ({ tau, omega, g, emissionTop: top, emissionBottom: bottom })

  it('ω = 0 reduces to Schwarzschild absorption–emission with the diffusivity factor D: closed form for a Planck source linear in τ', () => {
    // dF↑/dτ = D(F↑ − πB), dF↓/dτ = −D(F↓ − πB), πB = b0 + b1 τ: integrating along τ,
    // F↑(0) = F↑(τ)e^{−Dτ} + b0(1 − e^{−Dτ}) + b1[(1 − e^{−Dτ})/D − τe^{−Dτ}]   (Goody & Yung 1989, ch. 2, from memory)
    // F↓(τ) = b0(1 − e^{−Dτ}) + b1[τ − (1 − e^{−Dτ})/D]
    for (const D of [2, 1.66]) for (const tau of [1e-4, 0.05, 0.7, 3, 20]) {
      const b0 = 120
      const bt = 180
      const b1 = (bt - b0) / tau
      const surface = 210
      const r = thermalTwoStream({ layers: [layer(tau, 0, 0.5, b0, bt)], surfaceEmissivity: 1, surfaceEmission: surface, diffusivity: D })
      const e = Math.exp(-D * tau)
      const down = b0 * (1 - e) + b1 * (tau - (1 - e) / D)
      const up = surface * e + b0 * (1 - e) + b1 * ((1 - e) / D - tau * e)
      expect(r.down[1]).toBeCloseTo(down, 9)
      expect(r.up[0]).toBeCloseTo(up, 9)
      expect(r.down[0]).toBe(0)
    }
  })
  it('a scattering layer that does not emit reflects and transmits diffuse light as the closed two-stream form says: R = Γ(1 − e^{−2λτ})/(1 − Γ²e^{−2λτ}), T = (1 − Γ²)e^{−λτ}/(1 − Γ²e^{−2λτ}) (Meador & Weaver 1980, J. Atmos. Sci. 37:630; from memory)', () => {
    // lit from below by a black surface's flux E, with no source in the layer: what leaves the top is T·E, what goes
    // back down to the surface R·E (the surface, black, absorbs it)
    for (const [tau, omega, g] of [[0.3, 0.9, 0.6], [2, 0.5, 0.2], [0.05, 0.99, 0.8]]) {
      const E = 300
      const r = thermalTwoStream({ layers: [layer(tau, omega, g, 0, 0)], surfaceEmissivity: 1, surfaceEmission: E })
      const g1 = 2 - omega * (1 + g)
      const g2 = omega * (1 - g)
      const lam = Math.sqrt(g1 * g1 - g2 * g2)
      const G = g2 / (g1 + lam)
      const e1 = Math.exp(-lam * tau)
      const den = 1 - G * G * e1 * e1
      expect(r.up[0] / E).toBeCloseTo(((1 - G * G) * e1) / den, 12)
      expect(r.down[1] / E).toBeCloseTo((G * (1 - e1 * e1)) / den, 12)
    }
  })
  it('an optically thick non-scattering isothermal layer emits as a blackbody at its temperature, whatever lies below', () => {
    for (const eps of [0.5, 1]) {
      const r = thermalTwoStream({ layers: [layer(60, 0, 0, 150, 150)], surfaceEmissivity: eps, surfaceEmission: 390 })
      expect(r.up[0]).toBeCloseTo(150, 10)
      expect(r.down[1]).toBeCloseTo(150, 10)
    }
  })
  it('conserves energy: a conservatively scattering layer (ω = 1) passes the net flux unchanged, alone or among absorbing layers, to 1e-9', () => {
    const stacks: ThermalLayer[][] = [
      [layer(0.3, 1, 0.6, 100, 100), layer(2, 1, 0, 100, 100), layer(0.01, 1, 0.9, 100, 100)],
      [layer(0.4, 0.2, 0.3, 100, 130), layer(1.5, 1, 0.7, 130, 160), layer(0.8, 0.6, 0.5, 160, 200)]
    ]
    for (const layers of stacks) for (const eps of [0.6, 1]) {
      const r = thermalTwoStream({ layers, surfaceEmissivity: eps, surfaceEmission: 390 })
      const net = (i: number) => r.up[i] - r.down[i]
      layers.forEach((l, i) => {
        if (l.omega === 1) expect(Math.abs(net(i) - net(i + 1))).toBeLessThan(1e-9 * 390)
      })
    }
  })
  it('an isothermal stack over a black surface at its temperature, with no room to lose heat (a deep layer above), keeps πB everywhere below', () => {
    // Kirchhoff: in an enclosure at one temperature the field is the blackbody's, whatever ω and g
    const layers = [layer(200, 0, 0, 250, 250), layer(0.5, 0.7, 0.6, 250, 250), layer(1.2, 0.3, 0.2, 250, 250)]
    const r = thermalTwoStream({ layers, surfaceEmissivity: 1, surfaceEmission: 250 })
    for (let i = 1; i <= 3; i++) {
      expect(r.up[i]).toBeCloseTo(250, 9)
      expect(r.down[i]).toBeCloseTo(250, 9)
    }
  })
})

describe('infrared forcing of a layer (longwaveForcing)', () => {
  it('a layer that neither absorbs nor scatters (τ = 0) has zero forcing, and τ → 0 gives a vanishing one', () => {
    const zero = longwaveForcing({ ...site, bands: grey(0) })
    expect(zero.toaWm2).toBe(0)
    expect(zero.surfaceWm2).toBe(0)
    const tiny = longwaveForcing({ ...site, bands: grey(1e-9, 0.5, 0.5) })
    expect(Math.abs(tiny.clearSkyToaWm2)).toBeLessThan(1e-6)
    expect(Math.abs(tiny.clearSkySurfaceWm2)).toBeLessThan(1e-6)
  })
  it("an absorbing layer at the surface's temperature has no TOA effect in a transparent atmosphere over a black surface (Kirchhoff)", () => {
    // what it absorbs of the surface's πB it emits again at the same temperature. (A scattering layer is another
    // matter: it sends part of the surface's radiation back down, and that part is missing at the top.)
    for (const tau of [0.01, 0.8, 30]) {
      const r = longwaveForcing({ ...site, surfaceEmissivity: 1, lapseRateKPerKm: 0, transparentGases: true, bands: grey(tau, 0, 0) })
      expect(Math.abs(r.clearSkyToaWm2)).toBeLessThan(1e-9)
    }
    const scattering = longwaveForcing({ ...site, surfaceEmissivity: 1, lapseRateKPerKm: 0, transparentGases: true, bands: grey(0.8, 0.6, 0.3) })
    expect(scattering.clearSkyToaWm2).toBeGreaterThan(0)
  })
  it("an opaque black layer's TOA effect equals the Planck difference between surface and layer over the window (mpmath band integrals)", () => {
    // layer at 5.1 km: 288.15 − 6.5 × 5.1 = 255 K, the temperature of the reference integrals
    const r = longwaveForcing({ ...site, surfaceEmissivity: 1, layerHeightKm: 5.1, layerDepthKm: 0, transparentGases: true, bands: grey(1000, 0, 0) })
    expect(r.layerTemperatureK).toBeCloseTo(255, 2)
    const ref = (lo: number, t: number) => planckRef.find((c) => c.lo_um === lo && c.t_k === t)!.flux_w_m2
    LONGWAVE_BANDS.forEach((b, i) => {
      if (b.loUm < 8.5 || b.hiUm > 12.5) return
      const expected = ref(b.loUm, 288.15) - ref(b.loUm, 255)
      // the layer is 1 m deep: its top is 0.0065 K colder than 255 K
      expect(Math.abs(r.bandToaWm2[i] / expected - 1)).toBeLessThan(2e-4)
    })
  })
  it("with an emissivity per band, an opaque black layer's TOA effect in each band is ε_b F_b(T_s) − F_b(T_layer) (Kirchhoff: the surface emits ε_b of a blackbody; mpmath band integrals)", () => {
    const eps = LONGWAVE_BANDS.map((_, i) => 0.7 + 0.025 * i)
    const r = longwaveForcing({ ...site, surfaceEmissivity: eps, layerHeightKm: 5.1, layerDepthKm: 0, transparentGases: true, bands: grey(1000, 0, 0) })
    const ref = (lo: number, t: number) => planckRef.find((c) => c.lo_um === lo && c.t_k === t)!.flux_w_m2
    LONGWAVE_BANDS.forEach((b, i) => {
      if (b.loUm < 8.5 || b.hiUm > 12.5) return
      const expected = eps[i] * ref(b.loUm, 288.15) - ref(b.loUm, 255)
      expect(Math.abs(r.bandToaWm2[i] / expected - 1)).toBeLessThan(2e-4)
    })
  })
  it('the same emissivity in every band is the grey surface, and a wrong count of band emissivities or one out of range is refused at its band', () => {
    const bands = grey(0.2, 0.4, 0.5)
    const g = longwaveForcing({ ...site, surfaceEmissivity: 0.9, bands })
    const b = longwaveForcing({ ...site, surfaceEmissivity: LONGWAVE_BANDS.map(() => 0.9), bands })
    expect(b.toaWm2).toBe(g.toaWm2)
    expect(b.surfaceWm2).toBe(g.surfaceWm2)
    expect(() => longwaveForcing({ ...site, surfaceEmissivity: [0.9, 0.9], bands })).toThrow(/2 band emissivities/)
    expect(() => longwaveForcing({ ...site, surfaceEmissivity: LONGWAVE_BANDS.map((_, i) => (i === 3 ? 0.2 : 0.9)), bands })).toThrow(/surfaceEmissivity\[3\].*outside 0\.5 to 1/)
  })
  it('the reported figures are the clear-sky ones times (1 − cloud fraction), as for the sunlight part', () => {
    const clear = longwaveForcing({ ...site, bands: grey(0.2, 0.5, 0.5) })
    const cloudy = longwaveForcing({ ...site, cloudFraction: 0.6, bands: grey(0.2, 0.5, 0.5) })
    expect(cloudy.toaWm2).toBeCloseTo(0.4 * clear.toaWm2, 12)
    expect(cloudy.surfaceWm2).toBeCloseTo(0.4 * clear.surfaceWm2, 12)
  })
  it('an absorbing layer colder than the surface warms at the top and at the surface; the higher and colder, the more at the top', () => {
    const low = longwaveForcing({ ...site, layerHeightKm: 1, bands: grey(0.2, 0.4, 0.5) })
    const high = longwaveForcing({ ...site, layerHeightKm: 5, bands: grey(0.2, 0.4, 0.5) })
    expect(low.toaWm2).toBeGreaterThan(0)
    expect(high.toaWm2).toBeGreaterThan(low.toaWm2)
    expect(low.surfaceWm2).toBeGreaterThan(high.surfaceWm2)
  })
  it('clear-sky outgoing infrared over 4–40 µm of the model atmosphere is that of Earth, 200–280 W m⁻² (global clear-sky OLR about 265 W m⁻², Kiehl & Trenberth 1997, from memory)', () => {
    const r = longwaveForcing({ ...site, bands: grey(0) })
    expect(r.outgoingWm2).toBeGreaterThan(200)
    expect(r.outgoingWm2).toBeLessThan(280)
    expect(airTemperatureK(288.15, 20)).toBeCloseTo(216.65, 9) // U.S. Standard Atmosphere 1976 tropopause (handbook)
  })
  it('refuses out-of-range site inputs at their field, with the range and the reason', () => {
    const bad: [Partial<typeof site>, string][] = [
      [{ surfaceTemperatureK: 400 }, 'surfaceTemperatureK'],
      [{ surfaceEmissivity: 0.3 }, 'surfaceEmissivity'],
      [{ layerHeightKm: 20 }, 'layerHeightKm'],
      [{ waterColumnCm: -1 }, 'waterColumnCm']
    ]
    for (const [change, field] of bad) {
      let err: unknown
      try {
        longwaveForcing({ ...site, ...change, bands: grey(0.1) })
      } catch (e) {
        err = e
      }
      expect(err).toBeInstanceOf(InputError)
      expect((err as InputError).where).toBe(field)
      expect((err as InputError).message).toMatch(/outside .* to .*\(/)
    }
  })
})

describe('the forcing map with an infrared offset', () => {
  it('on the net zero line the thin-layer forcing (Chylek & Wong 1995, by thinLayerForcing) plus the offset is zero', () => {
    const m = forcingMap({ nSurfaceAlbedo: 41, nOmega: 11, omegaMin: 0.5, tau: 0.3, upscatter: 0.2, offsetWm2: 0.8 })
    expect(m.netZeroLine.surfaceAlbedo.length).toBeGreaterThan(5)
    m.netZeroLine.surfaceAlbedo.forEach((R, i) => {
      const f = thinLayerForcing({ tau: 0.3, omega: m.netZeroLine.omega[i], upscatter: 0.2, surfaceAlbedo: R }).forcingWm2
      expect(Math.abs(f + 0.8)).toBeLessThan(1e-9)
    })
    // a warming offset moves the zero line to higher ω (more scattering needed to cool)
    const i = m.netZeroLine.surfaceAlbedo.findIndex((r) => r === 0.25)
    const j = m.zeroLine.surfaceAlbedo.findIndex((r) => r === 0.25)
    expect(m.netZeroLine.omega[i]).toBeGreaterThan(m.zeroLine.omegaCritical[j])
    expect(forcingMap({ nSurfaceAlbedo: 5, nOmega: 5, tau: 0.3, upscatter: 0.2 }).netZeroLine.surfaceAlbedo.length).toBe(0)
  })
})

describe('net verdict', () => {
  it('adds the parts, names the larger one and keeps "too close to call" on the net', () => {
    const a = netVerdict({ sunlightWm2: -1.2, infraredWm2: 0.9, marginWm2: 0.5 })
    expect(a.netWm2).toBeCloseTo(-0.3, 12)
    expect(a.verdict).toBe('too close to call')
    expect(a.dominant).toBe('sunlight')
    const b = netVerdict({ sunlightWm2: -0.4, infraredWm2: 1.5, marginWm2: 0.5 })
    expect(b.verdict).toBe('warms')
    expect(b.dominant).toBe('infrared')
    expect(netVerdict({ sunlightWm2: -3, infraredWm2: 1, marginWm2: 0.5 }).verdict).toBe('cools')
  })
})
