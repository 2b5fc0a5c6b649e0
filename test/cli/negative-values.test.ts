// A negative number typed after its option with a space ("--x -1") gives the same range message as "--x=-1"
// (node:util parseArgs alone answers "argument is ambiguous" for the first spelling).
import { describe, expect, it } from 'vitest'
import { runForcing } from '../../src-main/cli/forcing.ts'
import { runGrowth } from '../../src-main/cli/growth.ts'
import { runPopulation } from '../../src-main/cli/population.ts'
import { runSphere } from '../../src-main/cli/sphere.ts'
import { expectOneLine, runHere } from './helpers.ts'

type Command = (argv: string[]) => number | Promise<number>

/** [command, option, negative value, the other arguments]; each value is outside its option's range. */
const cases: [string, Command, string, string, string[]][] = [
  ['sphere', runSphere, '--x', '-1', ['--m', '1.5']],
  ['sphere', runSphere, '--medium', '-1.33', ['--x', '1', '--m', '1.5']],
  ['forcing', runForcing, '--tau', '-1', ['--ssa', '0.9', '--upscatter', '0.2', '--surface-albedo', '0.1']],
  ['forcing', runForcing, '--ssa', '-0.5', ['--tau', '0.1', '--upscatter', '0.2', '--surface-albedo', '0.1']],
  ['forcing', runForcing, '--g', '-.3', ['--tau', '0.1', '--ssa', '0.9', '--two-stream', '--surface-albedo', '0.1']],
  ['growth', runGrowth, '--kappa', '-0.5', ['--rh', '90', '--diameter', '100nm']],
  ['population', runPopulation, '--rh', '-5', ['--mode', '1000,0.12um,1.8', '--m', '1.5+0i', '--wavelengths', '550nm']]
]

describe('negative numbers in options', () => {
  for (const [name, command, flag, value, rest] of cases) {
    it(`${name} ${flag} ${value} and ${flag}=${value} give the same one-line message`, async () => {
      const spaced = await runHere(command, [flag, value, ...rest])
      const joined = await runHere(command, [`${flag}=${value}`, ...rest])
      expect(joined.code).toBe(2)
      expect(spaced.code).toBe(2)
      expectOneLine(spaced.stderr)
      expect(spaced.stderr).not.toMatch(/ambiguous/)
      expect(spaced.stderr).toBe(joined.stderr)
      expect(spaced.stderr).toMatch(new RegExp(`[-\u2212]${String(-Number(value)).replace('.', '\\.')}\\b`)) // the range message quotes the value (with a hyphen or a minus sign)
    })
  }

  it('a value that merely starts with a dash but is not a number is still refused as before', async () => {
    const r = await runHere(runSphere, ['--x', '--m', '1.5'])
    expect(r.code).toBe(2)
    expectOneLine(r.stderr)
  })
})
