// g of small spheres, where it comes from the small leading terms of b_1 and a_2 (g ~ x²): against 40-digit
// mpmath values (test/reference/make_sphere_reference.py --small-g → sphere-small-g.json).
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { MieWorkspace, sphereEfficiencies } from '../../src-core/index.ts'

const ref = JSON.parse(readFileSync(new URL('../reference/sphere-small-g.json', import.meta.url), 'utf8')) as {
  cases: { x: number; m: [number, number]; g: number; qsca: number }[]
}

describe('g of small spheres to full precision (x from 1e-6 to 0.1)', () => {
  const ws = new MieWorkspace()
  for (const c of ref.cases) {
    it(`x = ${c.x}, m = ${c.m[0]}+${c.m[1]}i`, () => {
      const r = sphereEfficiencies(c.x, c.m[0], c.m[1], ws)
      expect(Math.abs(r.g - c.g) / Math.abs(c.g)).toBeLessThan(1e-12)
      expect(Math.abs(r.qsca - c.qsca) / c.qsca).toBeLessThan(1e-13)
    })
  }
})
