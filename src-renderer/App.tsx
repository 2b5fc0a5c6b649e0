import { sphereEfficiencies } from '../src-core/index.ts'

export function App() {
  const r = sphereEfficiencies(10, 1.5, 1)
  return (
    <main>
      <h1>Motebench</h1>
      <p>Sphere x = 10, m = 1.5 + 1i: Qext = {r.qext.toFixed(6)}</p>
    </main>
  )
}
