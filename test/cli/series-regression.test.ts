// motebench series: the output of a fixed sizer file, compared with the output the command wrote before its
// pipeline was made faster (reading, batching rows to workers, number formatting). A regression check that the
// arithmetic and its printed digits did not change, not a physics check (the physics of series is tested in
// series.test.ts and test/optics/bin-kernels.test.ts).
//
// fixtures/series-regression.csv: 240 invented rows on 40 bins (values of 1 to 8 significant digits, one empty
// row, one row with a bad cell on line 105). fixtures/series-regression.expected.csv was made by the pre-change
// code at commit e54ed4b with:
//   node bin/motebench.mjs series test/cli/fixtures/series-regression.csv --study resources/demo.mote \
//     --sample 'Winter wood smoke' --wavelengths 450,550,700 --workers 2 > test/cli/fixtures/series-regression.expected.csv
// One change since, by design: times are now written in canonical ISO 8601 ("2025-11-03T00:00:00Z", no ".000"),
// so the time column was rewritten with sed 's/\.000Z,/Z,/'; every figure is still the pre-change code's.
import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { repo, run } from './helpers.ts'

const input = join(repo, 'test/cli/fixtures/series-regression.csv')
const expected = join(repo, 'test/cli/fixtures/series-regression.expected.csv')
const args = (workers: string) => ['series', input, '--study', join(repo, 'resources/demo.mote'), '--sample', 'Winter wood smoke', '--wavelengths', '450,550,700', '--workers', workers]

describe('motebench series: same output as before the pipeline changed', () => {
  it('the fixed file gives the recorded CSV byte for byte, with 1 and 2 workers; the bad row is still skipped (exit 1)', async () => {
    const want = await readFile(expected, 'utf8')
    for (const workers of ['1', '2']) {
      const r = await run(args(workers))
      expect(r.code, r.stderr).toBe(1)
      expect(r.stderr).toMatch(/240 rows read, 239 written, 1 skipped/)
      expect(r.stderr).toMatch(/line 105 column 9/)
      expect(r.stdout === want, 'the output differs from fixtures/series-regression.expected.csv').toBe(true)
    }
  }, 120_000)
})
