// The size integration in steps (bulkOpticsSteps, src-core/optics/bulkOptics.ts): the app's workers run it a few
// milliseconds at a time, looking for newer work in between; the figures must not depend on that.
import { describe, expect, it } from 'vitest'
import { bulkOpticsAt, bulkOpticsSteps, demoStudy, OpticsWorkspace, samplePopulations, studyMaterials } from '../../src-core/index.ts'

const study = demoStudy()
const coastal = study.samples.find((s) => s.name.startsWith('Coastal haze'))!
const pops = samplePopulations(coastal, studyMaterials(study), 2.5)
const cond = { rhPercent: coastal.rh_percent, history: coastal.rh_history, temperatureK: coastal.temperature_k ?? 298.15 }

describe('stepped size integration', () => {
  it('pauses many times in a long integration and gives the figures of the one-go integration, bit for bit', () => {
    const whole = bulkOpticsAt(pops, 0.35, cond, { anglesDeg: [0, 90, 180] })
    const steps = bulkOpticsSteps(pops, 0.35, cond, { anglesDeg: [0, 90, 180] }, new OpticsWorkspace())
    let pauses = 0
    let r = steps.next()
    while (!r.done) {
      pauses++
      r = steps.next()
    }
    const stepped = r.value
    // thousands of Mie evaluations (some of them large spheres): far more than one step's work
    expect(stepped.evaluations).toBeGreaterThan(4_000)
    expect(pauses).toBeGreaterThan(10)
    for (const key of ['ext', 'sca', 'abs', 'g', 'backscatter', 'upscatterMean', 'evaluations', 'level'] as const) expect(stepped[key]).toBe(whole[key])
    expect(Array.from(stepped.phase!)).toEqual(Array.from(whole.phase!))
  })

  it('given up half way (as a superseded job is), it leaves its nodes counted in the cache, and they serve the next computation', () => {
    const ws = new OpticsWorkspace()
    const steps = bulkOpticsSteps(pops, 0.35, cond, {}, ws)
    for (let i = 0; i < 20; i++) steps.next()
    const spent = ws.evaluations
    expect(steps.return(undefined as never).done).toBe(true)
    // every node evaluated so far is counted against the cache's bound
    expect(ws.nodes.size).toBe(spent)
    const warm = bulkOpticsAt(pops, 0.35, cond, {}, ws)
    const cold = bulkOpticsAt(pops, 0.35, cond, {}, new OpticsWorkspace())
    for (const key of ['ext', 'sca', 'abs', 'g', 'backscatter', 'upscatterMean'] as const) expect(Math.abs(warm[key] - cold[key])).toBeLessThanOrEqual(1e-11 * Math.abs(cold[key]))
    expect(warm.evaluations).toBe(cold.evaluations - spent)
  })
})
