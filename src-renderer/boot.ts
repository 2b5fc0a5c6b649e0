// The page's first script: starts the computing workers (compute/early.ts, a few kilobytes), then loads the page's
// bundle. The workers' scripts then load and compile while the browser fetches and compiles the page's, instead of
// after it (the page's module ran 1.7–2.3 s after navigation at a load of 12, and the workers began only then).
import './compute/early.ts'

void import('./main.tsx')
