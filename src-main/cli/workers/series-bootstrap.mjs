// Starts the series worker (TypeScript) in a worker thread: registers tsx, resolved from this file so it works
// whatever the current directory, then loads the worker. Used by src-main/cli/series.ts.
import { register } from 'tsx/esm/api'

register()
await import('./series-worker.ts')
