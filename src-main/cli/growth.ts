// motebench growth: hygroscopic growth factor of one particle by κ-Köhler theory.
import { growthFactor, nearSaturationWarning, parseLength, parseTemperature } from '../../src-core/index.ts'
import { need, printJson, readArgs, readNumber } from './common.ts'

export const growthHelp = `motebench growth: wet/dry diameter ratio of a particle by κ-Köhler theory (Petters & Kreidenweis 2007)
  --kappa K             hygroscopicity κ, 0 to 2 (e.g. 0.61 for ammonium sulfate)
  --rh RH               relative humidity in percent, 0 to below 100
  --diameter D          dry diameter with a unit, e.g. 100nm
  --temperature T       temperature, e.g. 298K or 25degC (default 298.15 K; only the Kelvin term uses it)
  --no-kelvin           leave out the curvature (Kelvin) term
  --json                JSON output: {growth_factor, wet_diameter_nm, warnings} (warnings: from 95 % RH, where the
                        growth is too steep to trust; empty below)`

export function runGrowth(argv: string[]): number {
  const { values } = readArgs('growth', argv, {
    kappa: { type: 'string' },
    rh: { type: 'string' },
    diameter: { type: 'string' },
    temperature: { type: 'string' },
    'no-kelvin': { type: 'boolean', default: false },
    json: { type: 'boolean', default: false }
  })
  const kappa = readNumber(need(values.kappa, 'growth', '--kappa', '--kappa 0.61'), '--kappa')
  const rh = readNumber(need(values.rh, 'growth', '--rh', '--rh 90'), '--rh')
  const dryUm = parseLength(need(values.diameter, 'growth', '--diameter', '--diameter 100nm'), '--diameter')
  const temperatureK = values.temperature === undefined ? 298.15 : parseTemperature(values.temperature, '--temperature')
  const kelvin = !values['no-kelvin']
  const gf = growthFactor(dryUm, kappa, rh, { temperatureK, kelvin })
  const wetNm = gf * dryUm * 1000
  const warning = nearSaturationWarning(rh, kappa)
  const warnings = warning ? [warning] : []
  if (values.json) {
    printJson({ growth_factor: gf, wet_diameter_nm: wetNm, warnings })
    return 0
  }
  process.stdout.write(
    `growth factor ${Number(gf.toPrecision(6))}: a ${Number((dryUm * 1000).toPrecision(6))} nm dry particle with κ = ${kappa} is ${Number(wetNm.toPrecision(6))} nm at ${rh} % RH` +
      `${kelvin ? ` and ${Number(temperatureK.toPrecision(6))} K` : ' (no Kelvin term)'}\n`
  )
  for (const w of warnings) process.stdout.write(`warning: ${w}\n`)
  return 0
}
