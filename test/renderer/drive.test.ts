// drive() (src-renderer/compute/steps.ts) runs stepped work in a worker and gives it up once a newer job came in.
import { describe, expect, it } from 'vitest'
import { drive } from '../../src-renderer/compute/steps.ts'

function* counted(n: number, spinMs: number, out: { steps: number; ended?: boolean }): Generator<void, string> {
  try {
    for (let i = 0; i < n; i++) {
      const until = performance.now() + spinMs
      while (performance.now() < until) {
        // busy, like a size integration between its pauses
      }
      out.steps++
      yield
    }
    return 'done'
  } finally {
    out.ended = true
  }
}

describe('drive', () => {
  it('runs stepped work to its end while it is current', async () => {
    const out = { steps: 0 }
    expect(await drive(counted(20, 1, out), () => true)).toBe('done')
    expect(out.steps).toBe(20)
  })

  it('gives the work up at a look at the message queue once a newer job came in, ending the generator', async () => {
    const out: { steps: number; ended?: boolean } = { steps: 0 }
    let live = true
    setTimeout(() => (live = false), 20)
    // 10 s of work if it ran to its end
    expect(await drive(counted(10_000, 1, out), () => live)).toBeUndefined()
    expect(out.steps).toBeLessThan(10_000)
    // its finally blocks ran (the size integration counts its cached nodes there)
    expect(out.ended).toBe(true)
  })
})
