// The motebench command line. Each command reads its arguments, calls src-core's public API and prints.
import { runGuarded, UsageError } from './common.ts'
import { runSphere, sphereHelp } from './sphere.ts'
import { checkHelp, runCheck } from './check.ts'
import { demoHelp, runDemo } from './demo.ts'

interface Command {
  summary: string
  help: string
  run: (argv: string[]) => number | Promise<number>
}

const commands: Record<string, Command> = {
  sphere: { summary: 'efficiencies and angular scattering of one sphere', help: sphereHelp, run: runSphere },
  check: { summary: 'check a study (.mote) or a sizer file and list every problem', help: checkHelp, run: runCheck },
  demo: { summary: 'write the demo study (invented data) to DIR/demo.mote', help: demoHelp, run: runDemo }
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
