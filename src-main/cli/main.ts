// The motebench command line. Each command reads its arguments, calls src-core's public API and prints.
import { runGuarded, UsageError } from './common.ts'
import { startSeriesWorkersEarly } from './series-early.ts'
import { startUncertaintyWorkersEarly } from './uncertainty-args.ts'
import { dropEarly } from './workers/early.ts'

/** A command: its one-line summary here, its help and code loaded only when it is run (a quicker start). */
interface Command {
  summary: string
  load: () => Promise<{ help: string; run: (argv: string[]) => number | Promise<number> }>
  /** Called with the arguments before `load`: starts what can start while the command's code loads. */
  early?: (argv: string[]) => void
}

const commands: Record<string, Command> = {
  sphere: { summary: 'efficiencies and angular scattering of one sphere', load: async () => { const m = await import('./sphere.ts'); return { help: m.sphereHelp, run: m.runSphere } } },
  check: { summary: 'check a study (.mote) or a sizer file and list every problem', load: async () => { const m = await import('./check.ts'); return { help: m.checkHelp, run: m.runCheck } } },
  demo: { summary: 'write the demo study (invented data) to DIR/demo.mote', load: async () => { const m = await import('./demo.ts'); return { help: m.demoHelp, run: m.runDemo } } },
  materials: { summary: 'list the built-in components', load: async () => { const m = await import('./materials.ts'); return { help: m.materialsHelp, run: m.runMaterials } } },
  material: { summary: "one component's refractive index, density and κ at a wavelength", load: async () => { const m = await import('./materials.ts'); return { help: m.materialHelp, run: m.runMaterial } } },
  growth: { summary: 'hygroscopic growth factor of a particle (κ-Köhler)', load: async () => { const m = await import('./growth.ts'); return { help: m.growthHelp, run: m.runGrowth } } },
  population: { summary: 'bulk optics of lognormal modes of one composition', load: async () => { const m = await import('./population.ts'); return { help: m.populationHelp, run: m.runPopulation } } },
  forcing: { summary: 'direct-forcing estimate and verdict of a uniform layer', load: async () => { const m = await import('./forcing.ts'); return { help: m.forcingHelp, run: m.runForcing } } },
  study: { summary: "evaluate a study: every sample's optics, figures and forcing", load: async () => { const m = await import('./study.ts'); return { help: m.studyHelp, run: m.runStudy } } },
  series: { summary: 'optics of every distribution of a sizer time series', load: async () => { const m = await import('./series.ts'); return { help: m.seriesHelp, run: m.runSeries } }, early: startSeriesWorkersEarly },
  merge: { summary: 'several sizers (mobility, aerodynamic, optical) merged into one volume-equivalent distribution', load: async () => { const m = await import('./merge.ts'); return { help: m.mergeHelp, run: m.runMerge } } },
  uncertainty: { summary: "Monte Carlo uncertainty of a sample's 550 nm optics and forcing", load: async () => { const m = await import('./uncertainty.ts'); return { help: m.uncertaintyHelp, run: m.runUncertaintyCommand } }, early: startUncertaintyWorkersEarly },
  closure: { summary: 'effective refractive index from a size distribution and optical measurements', load: async () => { const m = await import('./closure.ts'); return { help: m.closureHelp, run: m.runClosure } } },
  truncation: { summary: "nephelometer angular-truncation correction from the particles' phase function", load: async () => { const m = await import('./truncation.ts'); return { help: m.truncationHelp, run: m.runTruncation } } },
  join: { summary: "the outputs of a run's shards (--shard K/N) as the run's one output", load: async () => { const m = await import('./join.ts'); return { help: m.joinHelp, run: m.runJoin } } },
  rebin: { summary: 'optical particle counter bin edges from PSL calibration to true diameters', load: async () => { const m = await import('./rebin.ts'); return { help: m.rebinHelp, run: m.runRebin } } }
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
    process.stdout.write(c ? (await c.load()).help + '\n' : overview())
    return 0
  }
  const command = commands[name]
  if (!command) throw new UsageError(`unknown command "${name}"; known: ${Object.keys(commands).join(', ')}`)
  const asksHelp = rest.includes('--help') || rest.includes('-h')
  if (!asksHelp) command.early?.(rest)
  const { help, run } = await command.load()
  if (asksHelp) {
    process.stdout.write(help + '\n')
    return 0
  }
  return run(rest)
}

process.exitCode = await runGuarded(() => main(process.argv.slice(2)))
dropEarly()
