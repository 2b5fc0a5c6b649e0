// The motebench command line. Each command reads its arguments, calls src-core's public API and prints.
import { runGuarded, UsageError } from './common.ts'
import { runSphere, sphereHelp } from './sphere.ts'
import { checkHelp, runCheck } from './check.ts'
import { demoHelp, runDemo } from './demo.ts'
import { runUncertaintyCommand, uncertaintyHelp } from './uncertainty.ts'
import { closureHelp, runClosure } from './closure.ts'
import { runTruncation, truncationHelp } from './truncation.ts'
import { rebinHelp, runRebin } from './rebin.ts'
import { materialHelp, materialsHelp, runMaterial, runMaterials } from './materials.ts'
import { growthHelp, runGrowth } from './growth.ts'
import { populationHelp, runPopulation } from './population.ts'
import { forcingHelp, runForcing } from './forcing.ts'
import { runStudy, studyHelp } from './study.ts'
import { runSeries, seriesHelp } from './series.ts'
import { mergeHelp, runMerge } from './merge.ts'

interface Command {
  summary: string
  help: string
  run: (argv: string[]) => number | Promise<number>
}

const commands: Record<string, Command> = {
  sphere: { summary: 'efficiencies and angular scattering of one sphere', help: sphereHelp, run: runSphere },
  check: { summary: 'check a study (.mote) or a sizer file and list every problem', help: checkHelp, run: runCheck },
  demo: { summary: 'write the demo study (invented data) to DIR/demo.mote', help: demoHelp, run: runDemo },
  materials: { summary: 'list the built-in components', help: materialsHelp, run: runMaterials },
  material: { summary: "one component's refractive index, density and κ at a wavelength", help: materialHelp, run: runMaterial },
  growth: { summary: 'hygroscopic growth factor of a particle (κ-Köhler)', help: growthHelp, run: runGrowth },
  population: { summary: 'bulk optics of lognormal modes of one composition', help: populationHelp, run: runPopulation },
  forcing: { summary: 'direct-forcing estimate and verdict of a uniform layer', help: forcingHelp, run: runForcing },
  study: { summary: "evaluate a study: every sample's optics, figures and forcing", help: studyHelp, run: runStudy },
  series: { summary: 'optics of every distribution of a sizer time series', help: seriesHelp, run: runSeries },
  merge: { summary: 'several sizers (mobility, aerodynamic, optical) merged into one volume-equivalent distribution', help: mergeHelp, run: runMerge },
  uncertainty: { summary: "Monte Carlo uncertainty of a sample's 550 nm optics and forcing", help: uncertaintyHelp, run: runUncertaintyCommand },
  closure: { summary: 'effective refractive index from a size distribution and optical measurements', help: closureHelp, run: runClosure },
  truncation: { summary: 'nephelometer angular-truncation correction from the particles\' phase function', help: truncationHelp, run: runTruncation },
  rebin: { summary: 'optical particle counter bin edges from PSL calibration to true diameters', help: rebinHelp, run: runRebin }
}

function overview(): string {
  const lines = Object.entries(commands).map(([name, c]) => `  ${name.padEnd(12)} ${c.summary}`)
  return `motebench: aerosol optics and direct-forcing estimates\n\nCommands:\n${lines.join('\n')}\n\nmotebench help COMMAND shows a command's options.\n`
}

async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv
  if (!name || name === '--help' || name === '-h') {
    process.stdout.write(overview())
    return 0
  }
  if (name === 'help') {
    const c = rest[0] ? commands[rest[0]] : undefined
    process.stdout.write(c ? c.help + '\n' : overview())
    return 0
  }
  const command = commands[name]
  if (!command) throw new UsageError(`unknown command "${name}"; known: ${Object.keys(commands).join(', ')}`)
  if (rest.includes('--help') || rest.includes('-h')) {
    process.stdout.write(command.help + '\n')
    return 0
  }
  return command.run(rest)
}

process.exitCode = await runGuarded(() => main(process.argv.slice(2)))
