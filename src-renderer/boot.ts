// The page's entry: starts the optics workers (compute/start.ts), then loads the page itself, so the workers load
// their scripts while the page's bundle is fetched, compiled and first drawn.
import { startWorkersEarly } from './compute/start.ts'

startWorkersEarly()
import('./main.tsx').catch((e: unknown) => {
  document.body.textContent = `Motebench could not load its page: ${e instanceof Error ? e.message : String(e)}. Reload the window; if this repeats, reinstall the app.`
})
