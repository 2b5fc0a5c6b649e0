// The catalogue against the published tables it was read from: the public-domain (CC0) refractiveindex.info database
// files saved unchanged in test/reference/optical-constants/ (see scripts/make_optical_tables.py). At every row of a
// copy inside the stretch of the catalogue it supplies, the catalogue's index (through the public API, interpolated
// between its kept rows) must match the copy within the stated tolerance.
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { getMaterial, indexSourceAt, refractiveIndexAt } from '../../src-core/index.ts'

const DIR = new URL('../reference/optical-constants/', import.meta.url)

interface Copy {
  text: string
  rows: [number, number, number][]
}

/** The copy's text and its "tabulated nk" rows (read here independently of the generator script). */
function readCopy(name: string): Copy {
  const text = readFileSync(new URL(name, DIR), 'utf8')
  const lines = text.split('\n')
  const start = lines.findIndex((l) => /^\s*data: \|\s*$/.test(l))
  expect(start, `${name}: a "data: |" block`).toBeGreaterThan(0)
  const rows: [number, number, number][] = []
  for (const line of lines.slice(start + 1)) {
    const cells = line.trim().split(/\s+/)
    if (cells.length !== 3 || cells.some((c) => !Number.isFinite(Number(c)))) break
    rows.push([Number(cells[0]), Number(cells[1]), Number(cells[2])])
  }
  return { text, rows }
}

// id, copy file, database path, author in the copy's REFERENCES, stretch of the catalogue it supplies (µm), and the
// tolerance of the interpolation between kept rows: |Δn| <= tn, |Δk| <= tkAbs + tkRel·k (the generator's stated
// tolerances; the copies' own precision is 0.001 in n, and 0.001 in k for the Querry 1987 tables; 0.0001 in n and
// four figures in k for Sani & Dell'Oro 2014)
const CASES = [
  { id: 'water', file: 'water-Hale.yml', path: 'database/data-nk/main/H2O/Hale.yml', author: 'Hale', lo: 0.2, hi: 40, tn: 0.003, tkAbs: 0, tkRel: 0.05 },
  { id: 'sea-salt', file: 'NaCl-Querry.yml', path: 'database/data-nk/main/NaCl/Querry.yml', author: 'Querry', lo: 2.5, hi: 40, tn: 0.003, tkAbs: 0.002, tkRel: 0.1 },
  { id: 'mineral-dust', file: 'illite-Querry.yml', path: 'database/data-nk/other/clays/illite/Querry.yml', author: 'Querry', lo: 2.5, hi: 40, tn: 0.02, tkAbs: 0.01, tkRel: 0.1 },
  // ethylene glycol (Sani & Dell'Oro 2014) stands in for both organic components beyond 2.5 µm
  { id: 'organic-matter', file: 'ethylene-glycol-Sani.yml', path: 'database/data-nk/organic/C2H6O2 - ethylene glycol/Sani.yml', author: 'Sani', lo: 2.5, hi: 40, tn: 0.003, tkAbs: 0.0005, tkRel: 0.1 },
  { id: 'brown-carbon', file: 'ethylene-glycol-Sani.yml', path: 'database/data-nk/organic/C2H6O2 - ethylene glycol/Sani.yml', author: 'Sani', lo: 2.5, hi: 40, tn: 0.003, tkAbs: 0.0005, tkRel: 0.1 }
]

describe('catalogue against the saved optical-constant copies (refractiveindex.info database, CC0)', () => {
  for (const c of CASES) {
    it(`${c.id}: every row of ${c.path} from ${c.lo} to ${c.hi} µm within |Δn| ≤ ${c.tn}, |Δk| ≤ ${c.tkAbs} + ${c.tkRel}·k`, () => {
      const copy = readCopy(c.file)
      // the copy is kept with its licence and reference lines
      expect(copy.text).toContain('refractiveindex.info database is in the public domain')
      expect(copy.text).toContain('CC0 1.0')
      expect(copy.text).toMatch(/REFERENCES:/)
      expect(copy.text).toContain(c.author)
      const m = getMaterial(c.id)
      const inside = copy.rows.filter((r) => r[0] >= c.lo - 1e-9 && r[0] <= c.hi + 1e-9)
      expect(inside.length).toBeGreaterThan(20)
      for (const [wl, n, k] of inside) {
        const v = refractiveIndexAt(m, wl)
        expect(Math.abs(v.n - n), `${c.id} n at ${wl} µm: catalogue ${v.n}, copy ${n}`).toBeLessThanOrEqual(c.tn + 1e-12)
        expect(Math.abs(v.k - k), `${c.id} k at ${wl} µm: catalogue ${v.k}, copy ${k}`).toBeLessThanOrEqual(c.tkAbs + c.tkRel * k + 1e-15)
        const source = indexSourceAt(m, wl)
        expect(source, `${c.id} source at ${wl} µm`).toContain(`file ${c.path}`)
        expect(source).toContain(c.author)
        expect(source).toMatch(/(19|20)\d\d/)
      }
    })
  }

  it('water keeps Hale & Querry 1973 exactly at the demo wavelengths 0.35–2.0 µm that the copy tabulates (Table I values)', () => {
    const copy = readCopy('water-Hale.yml')
    const w = getMaterial('water')
    for (const wl of [0.35, 0.4, 0.45, 0.5, 0.55, 0.6, 0.7, 0.8, 1.0, 2.0]) {
      const row = copy.rows.find((r) => Math.abs(r[0] - wl) < 1e-9)!
      const v = refractiveIndexAt(w, wl)
      expect(v.n).toBe(row[1])
      expect(v.k).toBe(row[2])
    }
  })
})
