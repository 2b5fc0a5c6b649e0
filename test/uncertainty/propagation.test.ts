// Uncertainty propagation through a sample's optics and forcing: the plain calculation when nothing spreads,
// closed-form spreads in linear cases, exact repetition, Latin hypercube strata, early stop and cancellation.
import { describe, expect, it } from 'vitest'
import {
  computeDraws,
  computeSampleOptics,
  demoStudy,
  InputError,
  mergeDrawBlocks,
  parseStudy,
  planUncertainty,
  runUncertainty,
  sampleForcing,
  serializeStudy,
  UNCERTAINTY_FIGURES,
  type Study,
  type UncertainInput
} from '../../src-core/index.ts'

const SOOT = 'Aged soot with sulfate coating' // the demo's quickest sample to compute
const SULFATE = 'Humid sulfate–nitrate episode'

function study(): Study {
  return demoStudy()
}
const fig = (r: ReturnType<typeof runUncertainty>, key: string) => r.figures.find((f) => f.key === key)!

describe('uncertainty propagation', () => {
  it('with every spread zero, every draw is the plain calculation (computeSampleOptics + sampleForcing)', () => {
    const s = study()
    const sample = s.samples.find((x) => x.name === SOOT)!
    const inputs: UncertainInput[] = [
      { quantity: 'k', material: 'black-carbon', apply: 'factor', distribution: { kind: 'normal', mean: 1, sd: 0 } },
      { quantity: 'median', mode: 0, apply: 'factor', distribution: { kind: 'lognormal', median: 1, gsd: 1 } },
      { quantity: 'rh', apply: 'add', distribution: { kind: 'uniform', lo: 0, hi: 0 } },
      { quantity: 'transmittance', apply: 'factor', distribution: { kind: 'normal', mean: 1, sd: 0 } }
    ]
    const r = runUncertainty(s, SOOT, { draws: 3, seed: 4, inputs, precision: 0 })
    // the same calculation by hand (definition): 550 nm, tolerance 1e-3, no angular output
    const optics = computeSampleOptics(sample, { wavelengths_nm: [550] }, { tolerance: 1e-3, angularWavelengthsNm: [] })
    const forcing = sampleForcing(optics, s.site, s.verdict_margin_w_m2)
    const row = optics.wavelengths[0]
    const plain: Record<string, number> = {
      ext: row.ext, sca: row.sca, abs: row.abs, ssa: row.ssa, g: row.g, upscatter: row.upscatter_fraction, tau: row.optical_depth,
      forcing: forcing.thin_layer_w_m2, forcing_daily_mean: forcing.daily_mean_w_m2, forcing_two_stream_toa: forcing.two_stream.toa_w_m2,
      longwave_toa: forcing.longwave_toa_w_m2!, net_toa: forcing.net_toa_w_m2
    }
    for (const f of UNCERTAINTY_FIGURES) {
      const got = fig(r, f.key)
      expect(got.median).toBe(plain[f.key])
      expect(got.p05).toBe(plain[f.key])
      expect(got.p95).toBe(plain[f.key])
      expect(got.sd).toBe(0)
      expect(got.central).toBe(plain[f.key])
    }
    // P(warm) is on the net forcing, sunlight + infrared, the one the verdict uses
    expect(forcing.net_toa_w_m2).toBe(forcing.thin_layer_w_m2 + forcing.longwave_toa_w_m2!)
    expect(r.warming.probability).toBe(forcing.net_toa_w_m2 > 0 ? 1 : 0)
    expect(r.warming.standard_error).toBe(0)
    expect(r.sensitivity.ranking.every((e) => e.rho === null)).toBe(true)
    // and close to the study's full calculation (all wavelengths, default tolerance 1e-4): the thin-layer forcing
    // only uses 550 nm figures
    const full = sampleForcing(computeSampleOptics(sample, s), s.site, s.verdict_margin_w_m2)
    expect(Math.abs(fig(r, 'forcing').median - full.thin_layer_w_m2)).toBeLessThan(3e-3 * Math.abs(full.thin_layer_w_m2))
  })

  it('a normal layer depth spreads the forcing by |∂F/∂τ|·sd(τ) (thin-layer forcing is linear in τ; Chylek & Wong 1995)', () => {
    const s = study()
    const depth = 1500
    const sdDepth = 150
    const r = runUncertainty(s, SOOT, { draws: 100, seed: 2, sampling: 'latin-hypercube', inputs: [{ quantity: 'layer', apply: 'set', distribution: { kind: 'normal', mean: depth, sd: sdDepth } }] })
    const f0 = fig(r, 'forcing').central
    const tau0 = fig(r, 'tau').central
    // closed form: F = (F0/τ0)·τ and τ = τ0·D/D0, so sd(F) = |F0/τ0| · τ0 sd(D)/D0
    const expected = Math.abs(f0 / tau0) * tau0 * (sdDepth / depth)
    // Latin hypercube with 100 strata pins the sample sd to about 1 % of the distribution's (allow 3 %)
    expect(Math.abs(fig(r, 'forcing').sd - expected)).toBeLessThan(0.03 * expected)
    expect(Math.abs(fig(r, 'forcing').mean - f0)).toBeLessThan(0.02 * Math.abs(f0))
    // the optics do not depend on the depth
    expect(fig(r, 'ext').sd).toBe(0)
  })

  it('P(warm) for a uniform surface albedo is the share of its range above the albedo where the net forcing flips (closed form)', () => {
    const s = study()
    const sample = s.samples.find((x) => x.name === SOOT)!
    const plain = sampleForcing(computeSampleOptics(sample, { wavelengths_nm: [550] }, { tolerance: 1e-3, angularWavelengthsNm: [] }), s.site, s.verdict_margin_w_m2)
    // net = ΔF_sun(R) + ΔF_ir, with ΔF_sun = −C[2(1 − R)²β̄τ_sca − 4Rτ_abs], C = (S₀/4)T²(1 − A_c) (Chylek & Wong 1995)
    // and ΔF_ir independent of R: net = 0 is a quadratic in R, 2β̄τ_s(1 − R)² − 4τ_a R = ΔF_ir/C
    const C = (1361 / 4) * s.site.transmittance ** 2 * (1 - s.site.cloud_fraction)
    const ts = plain.tau_550 * plain.ssa_550
    const ta = plain.tau_550 - ts
    const a = 2 * plain.upscatter_550 * ts
    const rhs = plain.longwave_toa_w_m2! / C
    // a(1 − R)² − 4τ_a R − rhs = 0 → aR² − (2a + 4τ_a)R + (a − rhs) = 0, the root in 0..1
    const B = 2 * a + 4 * ta
    const flip = (B - Math.sqrt(B * B - 4 * a * (a - rhs))) / (2 * a)
    expect(flip).toBeLessThan(plain.flip_surface_albedo!)
    expect(flip).toBeGreaterThan(0.05)
    const lo = Math.max(0, flip - 0.1)
    const hi = Math.min(1, flip + 0.2)
    const albedo: UncertainInput = { quantity: 'surface_albedo', apply: 'set', distribution: { kind: 'uniform', lo, hi } }
    // a small spread on the transmittance, which moves the forcing but not its sign
    const trans: UncertainInput = { quantity: 'transmittance', apply: 'factor', distribution: { kind: 'normal', mean: 1, sd: 0.01 }, bounds: { lo: 0.95, hi: 1.05, method: 'clamp' } }
    const r = runUncertainty(s, SOOT, { draws: 200, seed: 9, sampling: 'latin-hypercube', inputs: [albedo, trans] })
    // forcing rises with the surface albedo for an absorbing layer (common practice): warm above the flip
    const expected = (hi - flip) / (hi - lo)
    expect(Math.abs(r.warming.probability - expected)).toBeLessThanOrEqual(2 / 200)
    expect(r.warming.standard_error).toBeCloseTo(Math.sqrt((r.warming.probability * (1 - r.warming.probability)) / 200), 12)
    expect(r.sensitivity.ranking[0].label).toMatch(/surface albedo/)
    expect(r.sensitivity.ranking[0].rho!).toBeGreaterThan(0.9)
  })

  it('repeats exactly for a seed, and blocks computed apart merge to the same draws', () => {
    const s = study()
    const inputs: UncertainInput[] = [
      { quantity: 'cloud_fraction', apply: 'add', distribution: { kind: 'normal', mean: 0, sd: 0.1 }, bounds: { lo: -0.5, hi: 0.3, method: 'resample' } },
      { quantity: 'surface_albedo', apply: 'factor', distribution: { kind: 'lognormal', median: 1, gsd: 1.2 }, bounds: { hi: 3, method: 'clamp' } }
    ]
    const plan = planUncertainty(s, SOOT, { draws: 30, seed: 5, inputs })
    const whole = computeDraws(plan, 0, 30)
    const parts = mergeDrawBlocks([computeDraws(plan, 17, 30), computeDraws(plan, 0, 9), computeDraws(plan, 9, 17)], inputs.length)
    expect(Array.from(parts.outputs)).toEqual(Array.from(whole.outputs))
    expect(Array.from(parts.inputs)).toEqual(Array.from(whole.inputs))
    expect(Array.from(computeDraws(planUncertainty(s, SOOT, { draws: 30, seed: 5, inputs }), 0, 30).outputs)).toEqual(Array.from(whole.outputs))
    expect(Array.from(computeDraws(planUncertainty(s, SOOT, { draws: 30, seed: 6, inputs }), 0, 30).outputs)).not.toEqual(Array.from(whole.outputs))
    // merging refuses a gap
    expect(() => mergeDrawBlocks([computeDraws(plan, 0, 5), computeDraws(plan, 6, 9)], inputs.length)).toThrow(InputError)
  })

  it("draws started before the plan's unperturbed optics came are the same draws (their forcing waits for them)", () => {
    const s = study()
    const inputs: UncertainInput[] = [
      { quantity: 'rh', apply: 'add', distribution: { kind: 'normal', mean: 0, sd: 4 }, bounds: { lo: -10, hi: 10, method: 'clamp' } },
      { quantity: 'median', apply: 'factor', distribution: { kind: 'lognormal', median: 1, gsd: 1.1 } },
      { quantity: 'surface_albedo', apply: 'set', distribution: { kind: 'uniform', lo: 0.05, hi: 0.35 } }
    ]
    const options = { draws: 12, seed: 8, inputs }
    const whole = computeDraws(planUncertainty(s, SOOT, options), 0, 12)
    const nominal = planUncertainty(s, SOOT, options).nominal!
    // the optics arrive before the fifth draw, or only when the block asks for them with wait
    for (const after of [4, Infinity]) {
      const later = planUncertainty(s, SOOT, options, 'later')
      expect(later.nominal).toBeNull()
      let asked = 0
      const block = computeDraws(later, 0, 12, undefined, undefined, (wait) => (wait || ++asked > after ? nominal : null))
      expect(Array.from(block.outputs)).toEqual(Array.from(whole.outputs))
    }
    // without a source the block computes them itself
    expect(Array.from(computeDraws(planUncertainty(s, SOOT, options, 'later'), 0, 12).outputs)).toEqual(Array.from(whole.outputs))
  })

  it('Latin hypercube: each of the N strata of every input gets exactly one draw (McKay et al. 1979)', () => {
    const s = study()
    const n = 64
    // uniform(0, 1) variates set as the value: the variate is the stratified uniform number itself
    const inputs: UncertainInput[] = [
      { quantity: 'surface_albedo', apply: 'set', distribution: { kind: 'uniform', lo: 0, hi: 1 } },
      { quantity: 'cloud_fraction', apply: 'set', distribution: { kind: 'uniform', lo: 0, hi: 1 } }
    ]
    const plan = planUncertainty(s, SOOT, { draws: n, seed: 3, sampling: 'latin-hypercube', inputs })
    const b = computeDraws(plan, 0, n)
    for (let j = 0; j < inputs.length; j++) {
      const strata = Array.from({ length: n }, (_, i) => Math.floor(b.inputs[i * inputs.length + j] * n)).sort((a, c) => a - c)
      expect(strata).toEqual(Array.from({ length: n }, (_, i) => i))
    }
  })

  it('stops early once the standard error of P(warm) is below the precision', () => {
    const s = study()
    // the humid sulfate layer cools at any cloud fraction: P(warm) = 0, Laplace SE at 0 of 100 ≈ 0.0099
    const r = runUncertainty(s, SULFATE, { draws: 1000, seed: 1, precision: 0.01, minDraws: 100, inputs: [{ quantity: 'cloud_fraction', apply: 'set', distribution: { kind: 'uniform', lo: 0, hi: 0.3 } }] })
    expect(r.status).toBe('precision reached')
    expect(r.draws).toBe(100)
    expect(r.warming.probability).toBe(0)
  })

  it('cancels when the progress callback returns false, reporting the draws made', () => {
    const s = study()
    let calls = 0
    const r = runUncertainty(s, SOOT, { draws: 500, precision: 0, inputs: [{ quantity: 'surface_albedo', apply: 'set', distribution: { kind: 'uniform', lo: 0, hi: 0.5 } }] }, () => ++calls < 2)
    expect(r.status).toBe('cancelled')
    expect(r.draws).toBe(100)
    expect(r.requested_draws).toBe(500)
  })

  it('refuses inputs that could leave their valid range, unknown components and modes', () => {
    const s = study()
    const run = (input: UncertainInput) => () => planUncertainty(s, SOOT, { draws: 10, inputs: [input] })
    // a normal factor of sd 0.5 on k goes negative within its 1e-6 quantiles
    expect(run({ quantity: 'k', material: 'black-carbon', apply: 'factor', distribution: { kind: 'normal', mean: 1, sd: 0.5 } })).toThrow(/outside the valid range/)
    // bounds make it acceptable
    expect(run({ quantity: 'k', material: 'black-carbon', apply: 'factor', distribution: { kind: 'normal', mean: 1, sd: 0.5 }, bounds: { lo: 0.2, method: 'resample' } })).not.toThrow()
    expect(run({ quantity: 'k', material: 'sea-salt', apply: 'factor', distribution: { kind: 'lognormal', median: 1, gsd: 1.2 } })).toThrow(/no component "sea-salt"/)
    expect(run({ quantity: 'gsd', mode: 3, apply: 'add', distribution: { kind: 'normal', mean: 0, sd: 0.01 } })).toThrow(/no mode 3/)
    expect(() => planUncertainty(s, 'no such sample')).toThrow(InputError)
  })

  it('reads its settings from the study document, which validates them', () => {
    const s = study()
    s.uncertainty = {
      draws: 20,
      seed: 3,
      samples: { [SOOT]: { inputs: [{ quantity: 'surface_albedo', apply: 'set', distribution: { kind: 'uniform', lo: 0.1, hi: 0.2 } }] } }
    }
    const parsed = parseStudy(serializeStudy(s))
    expect(parsed.ok).toBe(true)
    if (parsed.ok) expect(planUncertainty(parsed.study, SOOT).draws).toBe(20)
    const bad = JSON.parse(serializeStudy(s))
    bad.uncertainty.samples[SOOT].inputs[0].distribution = { kind: 'normal', mean: 0, sd: -1 }
    const r = parseStudy(JSON.stringify(bad))
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.problems[0].path).toBe(`uncertainty.samples.${SOOT}.inputs[0].distribution.sd`)
  })
})

describe('uncertainty of the infrared part', () => {
  it('draws the infrared site inputs: the surface temperature moves the infrared and net figures, not the optics; net = sunlight + infrared in every draw', () => {
    const s = study()
    const inputs: UncertainInput[] = [
      { quantity: 'surface_temperature', apply: 'set', distribution: { kind: 'uniform', lo: 270, hi: 310 } },
      { quantity: 'water_column', apply: 'factor', distribution: { kind: 'lognormal', median: 1, gsd: 1.3 }, bounds: { lo: 0.5, hi: 2, method: 'resample' } }
    ]
    const plan = planUncertainty(s, SOOT, { draws: 40, seed: 3, inputs, precision: 0 })
    const block = computeDraws(plan, 0, 40)
    const k = (key: string) => UNCERTAINTY_FIGURES.findIndex((f) => f.key === key)
    const n = UNCERTAINTY_FIGURES.length
    const lw = new Set<number>()
    for (let i = 0; i < block.count; i++) {
      const o = block.outputs.subarray(i * n, (i + 1) * n)
      expect(o[k('net_toa')]).toBe(o[k('forcing')] + o[k('longwave_toa')])
      lw.add(o[k('longwave_toa')])
    }
    expect(lw.size).toBeGreaterThan(30)
    const r = runUncertainty(s, SOOT, { draws: 40, seed: 3, inputs, precision: 0 })
    expect(fig(r, 'ext').sd).toBe(0)
    expect(fig(r, 'longwave_toa').sd).toBeGreaterThan(0)
    // the ranking is against the net: the surface temperature, through the infrared, leads it
    expect(r.sensitivity.ranking[0].label).toMatch(/surface temperature/)
    expect(r.sensitivity.ranking[0].rho!).toBeGreaterThan(0.9)
  })
  it('a draw scales the unperturbed infrared band optics by its wet volume: exact for a change of amount, within 2 % of a full integration for a 30 % larger median on the fine soot sample', () => {
    const s = study()
    const k = UNCERTAINTY_FIGURES.findIndex((f) => f.key === 'longwave_toa')
    // the full computation of the changed sample, infrared bands integrated (definition of the figure)
    const full = (change: (m: { median_um: number }) => void, scaleAmount: number) => {
      const copy = structuredClone(s)
      const sample = copy.samples.find((x) => x.name === SOOT)!
      if (sample.size.kind !== 'modes') throw new Error('the soot sample has modes')
      for (const m of sample.size.modes) {
        change(m)
        if (m.by === 'number') m.number_cm3 *= scaleAmount
        else if (m.by === 'mass') m.mass_ug_m3 *= scaleAmount
        else if (m.by === 'volume') m.volume_um3_cm3 *= scaleAmount
      }
      const optics = computeSampleOptics(sample, { wavelengths_nm: [550] }, { tolerance: 1e-3, angularWavelengthsNm: [] })
      return sampleForcing(optics, copy.site, copy.verdict_margin_w_m2).longwave_toa_w_m2!
    }
    const modes = (s.samples.find((x) => x.name === SOOT)!.size as { modes: unknown[] }).modes.length
    const drawn = (inputs: UncertainInput[]) => computeDraws(planUncertainty(s, SOOT, { draws: 1, seed: 1, inputs, precision: 0 }), 0, 1).outputs[k]
    const twice = Array.from({ length: modes }, (_, mode): UncertainInput => ({ quantity: 'amount', mode, apply: 'factor', distribution: { kind: 'normal', mean: 2, sd: 0 } }))
    const a = drawn(twice)
    expect(Math.abs(a / full(() => {}, 2) - 1)).toBeLessThan(1e-9)
    // and the forcing is not linear in the layer's infrared optical depth: twice the amount is not twice the figure
    expect(Math.abs(a / full(() => {}, 1) - 2)).toBeGreaterThan(1e-3)
    // the small-particle limit (Bohren & Huffman 1983, §5.2): absorption goes with volume at these wavelengths
    const larger = Array.from({ length: modes }, (_, mode): UncertainInput => ({ quantity: 'median', mode, apply: 'factor', distribution: { kind: 'normal', mean: 1.3, sd: 0 } }))
    const b = drawn(larger)
    expect(Math.abs(b / full((m) => (m.median_um *= 1.3), 1) - 1)).toBeLessThan(0.02)
  })

  it('refuses an infrared input that could leave its range, with the range', () => {
    const s = study()
    expect(() => planUncertainty(s, SOOT, { draws: 10, inputs: [{ quantity: 'surface_emissivity', apply: 'set', distribution: { kind: 'uniform', lo: 0.3, hi: 1 } }] })).toThrow(InputError)
  })
})
