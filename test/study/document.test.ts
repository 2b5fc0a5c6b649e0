// The study document: schema validation (every problem at once, with JSON paths), versions, migration,
// serialisation and the demo study.
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import {
  demoStudy,
  listMaterials,
  looksLikeDelimitedTable,
  migrateStudy,
  parseStudy,
  serializeStudy,
  STUDY_VERSION,
  SURFACE_TYPES,
  type Study,
  type StudyProblem
} from '../../src-core/index.ts'

const root = new URL('../../', import.meta.url)
const read = (p: string): string => readFileSync(new URL(p, root), 'utf8')

/** The demo study as plain JSON, to break in one place per case. */
const demoJson = (): Record<string, any> => JSON.parse(JSON.stringify(demoStudy()))

function problemsOf(doc: unknown): StudyProblem[] {
  const r = parseStudy(JSON.stringify(doc, null, 2))
  if (r.ok) throw new Error('expected the document to be refused')
  return r.problems
}

describe('round trip', () => {
  it('parse(serialize(study)) gives back the same study', () => {
    const s = demoStudy()
    const r = parseStudy(serializeStudy(s))
    expect(r.ok).toBe(true)
    if (r.ok) expect(r.study).toEqual(s)
  })

  it('keeps optional parts: user materials, bins, uncertainty settings, custom surface', () => {
    const s: Study = {
      ...demoStudy(),
      user_materials: [{ id: 'valley-smoke', name: 'Valley smoke (invented)', index: { kind: 'expression', n: '1.55', k: '0.02 * (wl_nm/550)^-3' }, density_g_cm3: 1.4, kappa: 0.1, source: 'invented demo data' }],
      uncertainty: { draws: 200, seed: 7 },
      site: { ...demoStudy().site, surface: 'custom', surface_albedo: 0.31 }
    }
    s.samples[0] = {
      ...s.samples[0],
      composition: { components: [{ material: 'valley-smoke', volume_fraction: 1 }], mixing: 'volume-average', density_g_cm3: 1.4, kappa: 0.1 },
      size: { kind: 'bins', bins: { diameters: [20, 40, 80, 160], diameter_unit: 'nm', edges: true, quantity: 'dN/dlogDp', values: [1000, 2500, 800], source: 'invented' } }
    }
    const text = serializeStudy(s)
    const r = parseStudy(text)
    expect(r.ok ? r.study : r.problems).toEqual(s)
    // stable: writing the parsed study again gives the same bytes
    if (r.ok) expect(serializeStudy(r.study)).toBe(text)
  })

  it('writes 2-space indented JSON ending in one newline, independent of key order in memory', () => {
    const s = demoStudy()
    const text = serializeStudy(s)
    expect(text.endsWith('}\n')).toBe(true)
    expect(text.split('\n')[1]).toBe('  "format": "motebench-study",')
    const reordered = Object.fromEntries(Object.entries(s).reverse()) as unknown as Study
    expect(serializeStudy(reordered)).toBe(text)
  })
})

describe('broken documents: every problem, with its JSON path', () => {
  const cases: { name: string; edit: (d: Record<string, any>) => void; expect: [string, string][] }[] = [
    { name: 'gsd of 1', edit: (d) => (d.samples[2].size.modes[0].gsd = 1), expect: [['samples[2].size.modes[0].gsd', 'greater than 1']] },
    { name: 'RH of 100 %', edit: (d) => (d.samples[0].rh_percent = 100), expect: [['samples[0].rh_percent', 'not below 100']] },
    { name: 'negative RH', edit: (d) => (d.samples[1].rh_percent = -5), expect: [['samples[1].rh_percent', 'negative']] },
    { name: 'unknown material', edit: (d) => (d.samples[1].composition.components[0].material = 'moon-dust'), expect: [['samples[1].composition.components[0].material', '"moon-dust" is not a known material']] },
    { name: 'fractions not summing to 1', edit: (d) => (d.samples[4].composition.components[1].volume_fraction = 0.3), expect: [['samples[4].composition.components', 'sum to 0.85']] },
    { name: 'fraction above 1', edit: (d) => (d.samples[1].composition.components[0].volume_fraction = 1.2), expect: [['samples[1].composition.components[0].volume_fraction', 'from 0 to 1']] },
    { name: 'wavelength in µm', edit: (d) => (d.wavelengths_nm = [0.35, 0.55]), expect: [['wavelengths_nm[0]', 'outside 200 to 40000 nm'], ['wavelengths_nm[1]', 'outside 200 to 40000 nm']] },
    { name: 'wavelengths not ascending', edit: (d) => (d.wavelengths_nm = [550, 450, 700]), expect: [['wavelengths_nm[1]', 'must ascend']] },
    { name: 'wavelength repeated', edit: (d) => (d.wavelengths_nm = [450, 550, 550]), expect: [['wavelengths_nm[2]', 'twice']] },
    { name: 'latitude beyond the pole', edit: (d) => (d.site.latitude_deg = -91), expect: [['site.latitude_deg', 'outside']] },
    { name: 'day 367', edit: (d) => (d.site.day_of_year = 367), expect: [['site.day_of_year', '1 to 366']] },
    { name: 'fractional day', edit: (d) => (d.site.day_of_year = 12.5), expect: [['site.day_of_year', 'whole number']] },
    { name: 'cloud fraction in percent', edit: (d) => (d.site.cloud_fraction = 60), expect: [['site.cloud_fraction', 'from 0 to 1']] },
    { name: 'unknown surface', edit: (d) => (d.site.surface = 'lava'), expect: [['site.surface', '"lava" is not a known surface']] },
    { name: 'custom surface without albedo', edit: (d) => (d.site.surface = 'custom'), expect: [['site.surface_albedo', 'no surface_albedo']] },
    { name: 'number written as text', edit: (d) => (d.samples[3].size.modes[0].median_um = '0.15'), expect: [['samples[3].size.modes[0].median_um', 'must be a number']] },
    { name: 'missing field', edit: (d) => delete d.samples[0].rh_history, expect: [['samples[0].rh_history', 'missing']] },
    { name: 'misspelt field', edit: (d) => (d.site.latitude = 47), expect: [['site.latitude', 'not a field']] },
    { name: 'unknown mode kind', edit: (d) => (d.samples[0].size.modes[1].by = 'count'), expect: [['samples[0].size.modes[1].by', 'not an accepted']] },
    { name: 'unknown mixing rule', edit: (d) => (d.samples[0].composition.mixing = 'stirred'), expect: [['samples[0].composition.mixing', 'not an accepted value']] },
    { name: 'core-shell with one component', edit: (d) => (d.samples[3].composition.components = [{ material: 'black-carbon', volume_fraction: 1 }]), expect: [['samples[3].composition.components', 'core and a shell']] },
    {
      name: 'wavelengths beyond a catalogue table',
      edit: (d) => {
        d.samples = [d.samples[1]]
        d.wavelengths_nm = [250, 550]
      },
      expect: [['samples[0].composition.components[0].material', 'index covers']]
    },
    { name: 'no samples', edit: (d) => (d.samples = []), expect: [['samples', 'at least 1']] },
    {
      name: 'unsorted bins with the wrong count',
      edit: (d) => (d.samples[0].size = { kind: 'bins', bins: { diameters: [20, 80, 40], diameter_unit: 'nm', edges: false, quantity: 'dN/dlogDp', values: [5, 6] } }),
      expect: [['samples[0].size.bins.diameters[2]', 'must ascend'], ['samples[0].size.bins.values', '2 values need 2 bin midpoints']]
    },
    { name: 'negative bin value', edit: (d) => (d.samples[0].size = { kind: 'bins', bins: { diameters: [20, 40], diameter_unit: 'nm', edges: false, quantity: 'dN', values: [5, -1] } }), expect: [['samples[0].size.bins.values[1]', 'negative']] },
    {
      name: 'user material whose id is a catalogue id, and one with a broken expression',
      edit: (d) =>
        (d.user_materials = [
          { id: 'sea-salt', name: 'My salt', index: { kind: 'constant', n: 1.5, k: 0 }, density_g_cm3: 2.1, kappa: 1 },
          { id: 'odd-tar', name: 'Odd tar', index: { kind: 'expression', n: '1.6 +', k: '0' }, density_g_cm3: 1.3, kappa: 0 }
        ]),
      expect: [['user_materials[0].id', 'already a catalogue material id'], ['user_materials[1].index', 'does not parse']]
    }
  ]

  for (const c of cases) {
    it(c.name, () => {
      const d = demoJson()
      c.edit(d)
      const problems = problemsOf(d)
      for (const [path, fragment] of c.expect) {
        const hit = problems.find((p) => p.path === path && p.message.includes(fragment))
        expect(hit, `${path} "${fragment}" in ${JSON.stringify(problems, null, 1)}`).toBeDefined()
        expect(hit!.fix.length).toBeGreaterThan(10)
      }
      expect(problems).toHaveLength(c.expect.length)
    })
  }

  it('reports all problems of a document at once, each with a fix', () => {
    const d = demoJson()
    for (const c of cases.slice(0, 6)) c.edit(d)
    d.site.latitude_deg = 123
    d.wavelengths_nm[0] = 100
    const problems = problemsOf(d)
    const paths = problems.map((p) => p.path)
    expect(paths).toEqual(
      expect.arrayContaining([
        'samples[2].size.modes[0].gsd',
        'samples[0].rh_percent',
        'samples[1].rh_percent',
        'samples[1].composition.components[0].material',
        'samples[4].composition.components',
        'samples[1].composition.components[0].volume_fraction',
        'site.latitude_deg',
        'wavelengths_nm[0]'
      ])
    )
    expect(problems.length).toBe(8)
  })

  it('suggests the field that was meant', () => {
    const d = demoJson()
    d.site.latitude = 47
    d.samples[0].rh_percnt = 70
    const problems = problemsOf(d)
    expect(problems.find((p) => p.path === 'site.latitude')?.fix).toContain('"latitude_deg"')
    expect(problems.find((p) => p.path === 'samples[0].rh_percnt')?.fix).toContain('"rh_percent"')
  })

  it('explains the gsd, RH and material fixes in plain words', () => {
    const d = demoJson()
    d.samples[0].size.modes[0].gsd = 1
    d.samples[0].rh_percent = 101
    d.samples[0].composition.components[0].material = 'soot'
    const problems = problemsOf(d)
    const fixOf = (path: string) => problems.find((p) => p.path.startsWith(path))!.fix
    expect(fixOf('samples[0].size.modes[0].gsd')).toMatch(/same size.*1\.05 or more/)
    expect(fixOf('samples[0].rh_percent')).toMatch(/100 % and above is cloud, not aerosol/)
    const materialFix = fixOf('samples[0].composition.components[0].material')
    for (const m of listMaterials()) expect(materialFix).toContain(m.id)
  })
})

describe('format, version and syntax', () => {
  it('refuses a newer version, saying which version the file has and which this program reads', () => {
    const d = demoJson()
    d.version = STUDY_VERSION + 1
    const [p, ...rest] = problemsOf(d)
    expect(rest).toHaveLength(0)
    expect(p.path).toBe('version')
    expect(p.message).toContain(`version ${STUDY_VERSION + 1}`)
    expect(p.message).toContain(`versions 1 to ${STUDY_VERSION}`)
  })

  it('refuses a document of another format', () => {
    const d = demoJson()
    d.format = 'some-other-tool'
    const problems = problemsOf(d)
    expect(problems).toHaveLength(1)
    expect(problems[0].path).toBe('format')
    expect(problems[0].message).toContain('"some-other-tool"')
    expect(problemsOf({ name: 'x' })[0].message).toContain('no "format"')
    expect(problemsOf([1, 2])[0].path).toBe('document')
  })

  const syntax: [string, string, number, number, string][] = [
    ['missing value', '{\n  "format": "motebench-study",\n  "version": }\n', 3, 14, 'value is missing'],
    ['trailing comma in a list', '{\n  "wavelengths_nm": [350, 550,]\n}', 2, 31, 'trailing comma'],
    ['missing comma', '{\n  "a": 1\n  "b": 2\n}', 3, 3, 'expected "," or "}"'],
    ['decimal comma', '{\n  "gsd": 1,6\n}', 2, 11, 'decimal comma'],
    ['unclosed string', '{\n  "name": "Harrowmere\n}', 2, 11, 'not closed'],
    ['cut short', '{\n  "samples": [\n    {', 3, 6, 'cut short'],
    ['single quotes', "{\n 'name': 1 }", 2, 2, 'field name in double quotes'],
    ['empty file', '', 1, 1, 'empty']
  ]
  for (const [name, text, line, column, fragment] of syntax) {
    it(`JSON syntax error with line and column: ${name}`, () => {
      const r = parseStudy(text, 'broken.mote')
      expect(r.ok).toBe(false)
      if (r.ok) return
      expect(r.problems).toHaveLength(1)
      const p = r.problems[0]
      expect([p.line, p.column]).toEqual([line, column])
      expect(p.path).toBe(`broken.mote line ${line} column ${column}`)
      expect(p.message + ' ' + p.fix).toContain(fragment)
    })
  }

  it('says a sizer export or other CSV table is not a study, and points to the sizer import', () => {
    for (const file of ['resources/sizer-single-comma.csv', 'resources/sizer-series-semicolon.csv']) {
      const text = read(file)
      expect(looksLikeDelimitedTable(text), file).toBe(true)
      const r = parseStudy(text, 'export.csv')
      expect(r.ok).toBe(false)
      if (r.ok) return
      expect(r.problems).toHaveLength(1)
      expect(r.problems[0].path).toBe('export.csv document')
      expect(r.problems[0].message).toMatch(/table of values.*not a Motebench study/)
      expect(r.problems[0].fix).toMatch(/Import sizer file/)
    }
    // a tab-separated table of numbers, with a byte-order mark
    expect(looksLikeDelimitedTable('\uFEFFdiameter_um\tdN\n0.1\t1200\n0.2\t800\n')).toBe(true)
    // broken JSON stays a syntax error with its line and column, even with numbers and commas in it
    expect(looksLikeDelimitedTable('{\n  "wavelengths_nm": [350, 550,]\n}')).toBe(false)
    expect(looksLikeDelimitedTable('[1, 2]\n[3, 4]\n')).toBe(false)
    // plain prose is not a table
    expect(looksLikeDelimitedTable('Notes from the field, day 2\nThe inlet was wet.\n')).toBe(false)
  })

  it('accepts a byte-order mark before the JSON', () => {
    expect(parseStudy('\uFEFF' + serializeStudy(demoStudy())).ok).toBe(true)
  })
})

describe('migration from version 1', () => {
  it('upgrades the version 1 fixture: µm to nm, RH fraction to percent, rising branch, with a warning', () => {
    const r = parseStudy(read('test/study/fixtures/v1-study.mote'), 'v1-study.mote')
    expect(r.ok).toBe(true)
    if (!r.ok) return
    expect(r.warnings.some((w) => w.includes('migrated from version 1'))).toBe(true)
    expect(r.study.version).toBe(2)
    expect(r.study.wavelengths_nm).toEqual([350, 550, 1000])
    expect(r.study.samples[0].rh_percent).toBe(80)
    expect(r.study.samples[0].rh_history).toBe('rising')
    expect('wavelengths_um' in r.study).toBe(false)
    expect('rh' in r.study.samples[0]).toBe(false)
    // once saved, it is a version 2 file that reads without migration
    const again = parseStudy(serializeStudy(r.study))
    expect(again.ok && again.warnings).toEqual([])
  })

  it('does not change its input, and leaves version 2 documents alone', () => {
    const v1 = JSON.parse(read('test/study/fixtures/v1-study.mote'))
    const copy = JSON.parse(JSON.stringify(v1))
    const m = migrateStudy(v1)
    expect(v1).toEqual(copy)
    expect(m.fromVersion).toBe(1)
    const v2 = demoJson()
    expect(migrateStudy(v2).document).toBe(v2)
    expect(migrateStudy(v2).warnings).toEqual([])
  })

  it('names the version 1 field when a migrated value is wrong', () => {
    const v1 = JSON.parse(read('test/study/fixtures/v1-study.mote'))
    v1.samples[0].rh = 85 // percent written where version 1 wanted a fraction
    const problems = problemsOf(v1)
    expect(problems).toHaveLength(1)
    expect(problems[0].path).toBe('samples[0].rh_percent')
    expect(problems[0].message).toContain('samples[0].rh')
  })
})

describe('the demo study', () => {
  it('validates without warnings and uses only catalogue materials and a known surface', () => {
    const r = parseStudy(serializeStudy(demoStudy()))
    expect(r.ok && r.warnings).toEqual([])
    const ids = new Set(listMaterials().map((m) => m.id))
    const s = demoStudy()
    for (const sample of s.samples) {
      const comps = [sample.composition, ...(sample.size.kind === 'modes' ? sample.size.modes.map((m) => m.composition) : [])]
      for (const c of comps) for (const x of c?.components ?? []) expect(ids.has(x.material), x.material).toBe(true)
    }
    expect(SURFACE_TYPES.some((t) => t.id === s.site.surface)).toBe(true)
  })

  it('matches the brief: five invented samples, 12+ wavelengths from 350 to 2500 nm, ~47° N in winter', () => {
    const s = demoStudy()
    expect(s.samples).toHaveLength(5)
    for (const sample of s.samples) expect(sample.notes).toMatch(/invented demo data/i)
    expect(s.wavelengths_nm.length).toBeGreaterThanOrEqual(12)
    expect(s.wavelengths_nm[0]).toBe(350)
    expect(s.wavelengths_nm[s.wavelengths_nm.length - 1]).toBe(2500)
    expect(Math.abs(s.site.latitude_deg - 47)).toBeLessThan(1)
    expect(s.site.day_of_year < 60 || s.site.day_of_year > 335).toBe(true)
    const soot = s.samples.find((x) => x.composition.mixing === 'core-shell')!
    expect(soot.composition.components.map((c) => c.material)).toEqual(['black-carbon', 'ammonium-sulfate'])
    expect(s.samples.some((x) => x.size.kind === 'modes' && x.size.modes.length >= 3)).toBe(true)
  })

  it('resources/demo.mote is exactly the serialised demoStudy()', () => {
    expect(read('resources/demo.mote')).toBe(serializeStudy(demoStudy()))
  })

  it('demoStudy() returns a fresh copy each time', () => {
    const a = demoStudy()
    a.samples.pop()
    expect(demoStudy().samples).toHaveLength(5)
  })
})
