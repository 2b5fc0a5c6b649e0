import { describe, expect, it } from 'vitest'
import {
  aerodynamicDiameter,
  binsFromMeasurement,
  binValues,
  cunninghamSlipCorrection,
  dNdlnD,
  edgesFromMidpoints,
  InputError,
  integrationRange,
  type LognormalMode,
  massBelowCut,
  massBelowCutBins,
  type MeasuredBins,
  modeFromMass,
  modeFromNumber,
  modeFromVolume,
  moment
} from '../../src-core/index.ts'

/** Runs f, expects an InputError, returns it. */
function inputError(f: () => unknown): InputError {
  try {
    f()
  } catch (e) {
    expect(e).toBeInstanceOf(InputError)
    return e as InputError
  }
  throw new Error('expected an InputError, nothing was thrown')
}

const good = { number: 1000, median: 0.1, gsd: 1.6, name: 'accumulation' }
const edges10 = (unit: 'µm' | 'nm', values: number[]): MeasuredBins => ({
  diameters: [0.1, 0.2, 0.3, 0.4, 0.5, 0.6],
  diameterKind: 'edges',
  diameterUnit: unit,
  quantity: 'dN/dlogDp',
  values
})

// Each row: what is wrong, the call, the expected `where`, and a pattern the message must contain.
const cases: [string, () => unknown, string, RegExp][] = [
  // lognormal modes
  ['gsd = 1', () => modeFromNumber({ ...good, gsd: 1 }), 'mode (accumulation): gsd', /must be greater than 1/],
  ['gsd < 1 (looks like ln σ)', () => modeFromNumber({ ...good, gsd: 0.47 }), 'mode (accumulation): gsd', /If 0\.47 is ln σ_g, give σ_g = 1\.6/],
  ['gsd > 5', () => modeFromNumber({ ...good, gsd: 6 }), 'mode (accumulation): gsd', /above the accepted maximum 5/],
  ['gsd NaN', () => modeFromNumber({ ...good, gsd: NaN }), 'mode (accumulation): gsd', /NaN, not a finite number/],
  ['median 0', () => modeFromNumber({ ...good, median: 0 }), 'mode (accumulation): median', /count median diameter is 0 µm; it must be greater than 0/],
  ['median negative', () => modeFromNumber({ ...good, median: -0.1 }), 'mode (accumulation): median', /-0\.1 µm/],
  ['number negative', () => modeFromNumber({ ...good, number: -5 }), 'mode (accumulation): number', /-5 cm⁻³; it must not be negative/],
  ['number infinite', () => modeFromNumber({ ...good, number: Infinity }), 'mode (accumulation): number', /Infinity, not a finite number/],
  ['volume negative', () => modeFromVolume({ volume: -1, volumeMedian: 0.3, gsd: 1.5 }), 'mode: volume', /must not be negative/],
  ['volume median 0', () => modeFromVolume({ volume: 1, volumeMedian: 0, gsd: 1.5 }), 'mode: volumeMedian', /volume median diameter is 0/],
  ['mass NaN', () => modeFromMass({ mass: NaN, massMedian: 0.3, density: 1.5, gsd: 1.5 }), 'mode: mass', /NaN/],
  ['density 0', () => modeFromMass({ mass: 1, massMedian: 0.3, density: 0, gsd: 1.5, name: 'dust' }), 'mode (dust): density', /density is 0 g cm⁻³/],
  ['moment order NaN', () => moment(good, NaN), 'mode (accumulation): moment order', /not a finite number/],
  ['diameter 0 in dN/dlnD', () => dNdlnD(good, 0), 'mode (accumulation): diameter', /must be greater than 0/],
  [
    'second mode in a list is bad',
    () => massBelowCut([good, { number: 1, median: 2, gsd: 0.9, name: 'coarse' } as LognormalMode], 2.5, { diameter: 'geometric', density: 1.5 }),
    'mode 2 (coarse): gsd',
    /greater than 1/
  ],
  // bins
  ['unknown unit', () => binsFromMeasurement({ ...edges10('µm', [1, 1, 1, 1, 1]), diameterUnit: 'mm' as 'nm' }), 'bin diameters: unit', /unknown diameter unit "mm".*'nm', 'µm', 'um'/],
  [
    'unknown quantity',
    () => binsFromMeasurement({ ...edges10('µm', [1, 1, 1, 1, 1]), quantity: 'dN/dlnDp' as 'dN' }),
    'bin values: quantity',
    /unknown quantity "dN\/dlnDp".*'dN\/dlogDp', 'dN', 'dS\/dlogDp', 'dV\/dlogDp', 'dM\/dlogDp'/
  ],
  ['too few edges', () => binsFromMeasurement(edges10('µm', [1, 1, 1, 1, 1, 1])), 'bin diameters', /6 edges given for 6 values; n bins need n\+1 edges \(7\)/],
  ['midpoints count', () => binsFromMeasurement({ ...edges10('µm', [1, 1]), diameterKind: 'midpoints' }), 'bin diameters', /6 midpoints given for 2 values/],
  ['unsorted edges', () => binsFromMeasurement({ ...edges10('µm', [1, 1, 1, 1, 1]), diameters: [0.1, 0.3, 0.2, 0.4, 0.5, 0.6] }), 'bin 2 (0.3–0.2 µm)', /strictly ascending/],
  ['zero-width bin', () => binsFromMeasurement({ ...edges10('µm', [1, 1, 1, 1, 1]), diameters: [0.1, 0.2, 0.2, 0.4, 0.5, 0.6] }), 'bin 2 (0.2–0.2 µm)', /zero width/],
  ['negative edge', () => binsFromMeasurement({ ...edges10('µm', [1, 1, 1, 1, 1]), diameters: [-0.1, 0.2, 0.3, 0.4, 0.5, 0.6] }), 'bin 1 (-0.1–0.2 µm)', /not positive/],
  ['NaN edge', () => binsFromMeasurement({ ...edges10('µm', [1, 1, 1, 1, 1]), diameters: [0.1, 0.2, NaN, 0.4, 0.5, 0.6] }), 'bin 3 (NaN–0.4 µm)', /edge 3 is NaN/],
  ['negative value', () => binsFromMeasurement(edges10('µm', [1, 1, -3, 1, 1])), 'bin 3 (0.3–0.4 µm)', /value -3 is negative/],
  ['NaN value', () => binsFromMeasurement(edges10('µm', [1, 1, 1, NaN, 1])), 'bin 4 (0.4–0.5 µm)', /NaN, not a finite number/],
  [
    'negative value in nm data names the bin in nm',
    () => binsFromMeasurement({ diameters: Array.from({ length: 16 }, (_, i) => 25 * (i + 1)), diameterKind: 'edges', diameterUnit: 'nm', quantity: 'dN', values: Array.from({ length: 15 }, (_, i) => (i === 13 ? -1 : 1)) }),
    'bin 14 (350–375 nm)',
    /negative/
  ],
  ['dM without density', () => binsFromMeasurement({ ...edges10('µm', [1, 1, 1, 1, 1]), quantity: 'dM/dlogDp' }), 'bin values: density', /needs the particle density/],
  ['unsorted midpoints', () => edgesFromMidpoints([0.1, 0.3, 0.2]), 'bin 3 (midpoint 0.2 µm)', /strictly ascending/],
  ['one midpoint', () => edgesFromMidpoints([0.1]), 'bin midpoints', /1 midpoint given/],
  ['binValues dM without density', () => binValues(binsFromMeasurement(edges10('µm', [1, 1, 1, 1, 1])), 'dM/dlogDp'), 'bin values: density', /needs the particle density/],
  // cuts, aerodynamic diameter, grid
  ['cut 0', () => massBelowCut([good], 0, { diameter: 'geometric', density: 1 }), 'size cut', /cut diameter is 0 µm/],
  ['unknown cut diameter', () => massBelowCut([good], 2.5, { diameter: 'stokes' as 'geometric', density: 1 }), 'size cut: diameter', /unknown diameter kind "stokes"/],
  ['density list length', () => massBelowCut([good], 2.5, { diameter: 'geometric', density: [1, 2] }), 'size cut: density', /2 densities given for 1 modes/],
  ['shape factor < 1', () => massBelowCut([good], 2.5, { diameter: 'aerodynamic', density: 1, shapeFactor: 0.5 }), 'size cut: shapeFactor', /outside 1 to 5/],
  ['bin cut density', () => massBelowCutBins(binsFromMeasurement(edges10('µm', [1, 1, 1, 1, 1])), 1, { diameter: 'geometric', density: -1 }), 'size bins: density', /must be greater than 0/],
  ['no modes', () => massBelowCut([], 2.5, { diameter: 'geometric', density: 1 }), 'modes', /no modes/],
  ['slip at d = 0', () => cunninghamSlipCorrection(0), 'Cunningham slip correction: diameter', /greater than 0/],
  ['aerodynamic density NaN', () => aerodynamicDiameter(1, NaN), 'aerodynamic diameter: density', /NaN/],
  ['tail fraction 0', () => integrationRange([good], { tailFraction: 0 }), 'integration range: tailFraction', /not between 0 and 1/]
]

describe('bad input throws InputError saying where, what and how to fix (project rule)', () => {
  it.each(cases)('%s', (_label, call, where, pattern) => {
    const e = inputError(call)
    expect(e.where).toBe(where)
    expect(e.message).toMatch(pattern)
    expect(e.message.startsWith(where + ': ')).toBe(true)
    expect(e.fix.length).toBeGreaterThan(5)
  })

  it('the gsd ceiling is inclusive at 5 and the boundary values are accepted', () => {
    expect(modeFromNumber({ number: 0, median: 1e-3, gsd: 5 }).gsd).toBe(5)
  })
})
