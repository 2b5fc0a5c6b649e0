// The commands through the real entry point (node bin/motebench.mjs), as a user runs them: exit codes and
// one-line errors without stack traces. Started together to keep the folder quick.
import { beforeAll, describe, expect, it } from 'vitest'
import { expectOneLine, run, type Ran } from './helpers.ts'

let r: Record<string, Ran>
beforeAll(async () => {
  const cases: Record<string, string[]> = {
    growth: ['growth', '--kappa', '0.61', '--rh', '90', '--diameter', '100nm', '--no-kelvin', '--json'],
    unknownMaterial: ['material', 'unobtainium', '--wavelength', '550nm'],
    unknownCommand: ['spectrum'],
    help: ['help', 'series']
  }
  const names = Object.keys(cases)
  const results = await Promise.all(names.map((n) => run(cases[n])))
  r = Object.fromEntries(names.map((n, i) => [n, results[i]]))
}, 120_000)

describe('motebench through bin/motebench.mjs', () => {
  it('growth --json prints growth_factor and wet_diameter_nm; exit 0', () => {
    expect(r.growth.code).toBe(0)
    const g = JSON.parse(r.growth.stdout)
    expect(g.growth_factor).toBeCloseTo(Math.cbrt(1 + (0.61 * 90) / 10), 10) // Petters & Kreidenweis 2007 without the Kelvin term
    expect(g.wet_diameter_nm).toBeCloseTo(100 * g.growth_factor, 10)
  })

  it('bad input exits 2 with one line on stderr and no stack trace', () => {
    for (const k of ['unknownMaterial', 'unknownCommand']) {
      expect(r[k].code, k).toBe(2)
      expect(r[k].stdout).toBe('')
      expectOneLine(r[k].stderr)
    }
    expect(r.unknownMaterial.stderr).toMatch(/known: .*water/)
    expect(r.unknownCommand.stderr).toMatch(/series/)
  })

  it('help COMMAND shows the options', () => {
    expect(r.help.code).toBe(0)
    expect(r.help.stdout).toMatch(/--on-bad-row/)
    expect(r.help.stdout).toMatch(/--workers/)
  })
})
