// Starting a worker thread of the command line. Built (out/cli/*.mjs, what `motebench` runs): the worker's own
// built module beside this code, plain JavaScript. From the TypeScript source (the tests' in-process calls,
// `npm run bench`): the worker's .ts through tsx, a development dependency, which compiles it in the thread (a
// few seconds). With Node 20, `execArgv: ['--import', 'tsx']` on a Worker did not install tsx's loader in the
// worker ("Unknown file extension .ts"), so the worker starts from a line that registers tsx and imports the file.
import { Worker } from 'node:worker_threads'

const BUILT = import.meta.url.endsWith('.mjs')

export type CliWorker = 'series-worker' | 'uncertainty-worker'

export function startCliWorker(name: CliWorker, workerData: unknown): Worker {
  if (BUILT) return new Worker(new URL(`./${name}.mjs`, import.meta.url), { workerData })
  const source = new URL(`./${name}.ts`, import.meta.url).href
  const boot = `import(${JSON.stringify(import.meta.resolve('tsx/esm/api'))}).then((m) => { m.register(); return import(${JSON.stringify(source)}) })`
  return new Worker(boot, { eval: true, workerData })
}
