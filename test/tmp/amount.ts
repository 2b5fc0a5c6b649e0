const root = process.argv[2]
const core = await import(root + '/src-core/index.ts')
const { computeSampleOptics, OpticsWorkspace, demoStudy } = core
const study = demoStudy()
for (const name of ['Quarry dust event', 'Coastal haze day']) {
  const s = study.samples.find((x: any) => x.name === name)
  const ws = new OpticsWorkspace()
  const quick = computeSampleOptics(s, study, { workspace: ws, tolerance: 1e-2, coarsestStep: 2 })
  const full = computeSampleOptics(s, study, { workspace: ws })
  const ev = (r: any) => r.wavelengths.reduce((a: number, w: any) => a + (w.mie_evaluations ?? 0), 0)
  const out: string[] = [`${name}: quick ${ev(quick)} full ${ev(full)}`]
  for (const f of [1.1, 0.9, 1.21]) {
    const t = structuredClone(s)
    const m = t.size.modes[0]
    const key = Object.keys(m).find((k) => k === 'amount' || k === 'number' || k === 'mass' || k === 'value') ?? 'amount'
    m.mass_ug_m3 *= f
    const t0 = performance.now()
    const q = computeSampleOptics(t, study, { workspace: ws, tolerance: 1e-2, coarsestStep: 2 })
    const t1 = performance.now()
    const r = computeSampleOptics(t, study, { workspace: ws })
    const t2 = performance.now()
    out.push(`x${f}: quick ${ev(q)} evals ${(t1 - t0).toFixed(0)} ms, full ${ev(r)} evals ${(t2 - t1).toFixed(0)} ms`)
  }
  console.log(out.join('\n  '))
}
