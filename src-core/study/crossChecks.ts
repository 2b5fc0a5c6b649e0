// Cross checks on the raw document: relations between values (fractions summing to 1, ascending wavelengths and
// bin diameters, material ids and their index ranges, the surface, the campaign). Reads the document defensively,
// so it also runs when the schema found problems.
import { InputError } from '../errors.ts'
import { defineUserMaterial, listMaterials } from '../materials/index.ts'
import { SURFACE_TYPES } from '../climate/index.ts'
import { campaignProblems, campaignSettingsSchema } from '../field/campaign-settings.ts'
import type { CampaignSettings } from '../field/campaign-settings.ts'
import { fmt, STUDY_WAVELENGTH_RANGE_NM, userMaterial, type StudyProblem } from './schema.ts'

const [wlLo, wlHi] = STUDY_WAVELENGTH_RANGE_NM
type Json = Record<string, unknown>
export const isObject = (v: unknown): v is Json => typeof v === 'object' && v !== null && !Array.isArray(v)
export const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v)

/** Same tolerance as the mixing rules (src-core/materials/mixing.ts). */
const FRACTION_SUM_TOLERANCE = 1e-6

interface CrossContext {
  problems: StudyProblem[]
  warnings: string[]
  /** Catalogue and user material ids. */
  materialIds: Set<string>
  userIds: Set<string>
  /** Study wavelengths (nm) that are valid numbers. */
  wavelengthsNm: number[]
}

function checkComposition(c: unknown, at: string, ctx: CrossContext): void {
  if (!isObject(c) || !Array.isArray(c.components)) return
  const comps = c.components
  const fractions = comps.map((x) => (isObject(x) ? x.volume_fraction : undefined))
  if (comps.length > 0 && fractions.every((f) => isNum(f) && f >= 0 && f <= 1)) {
    const sum = (fractions as number[]).reduce((a, b) => a + b, 0)
    if (Math.abs(sum - 1) > FRACTION_SUM_TOLERANCE) {
      ctx.problems.push({
        path: `${at}.components`,
        message: `the volume fractions sum to ${fmt(sum)}, not 1`,
        fix: `Make the volume fractions of the components add up to 1 (now ${(fractions as number[]).map(fmt).join(' + ')}).`
      })
    }
  }
  if (c.mixing === 'core-shell' && comps.length < 2) {
    ctx.problems.push({ path: `${at}.components`, message: 'core-shell mixing needs a core and a shell, but there is only one component', fix: 'Add a shell component after the core, or choose "volume-average" mixing.' })
  }
  const catalogue = listMaterials()
  const lo = Math.min(...ctx.wavelengthsNm) / 1000
  const hi = Math.max(...ctx.wavelengthsNm) / 1000
  comps.forEach((comp, j) => {
    if (!isObject(comp) || typeof comp.material !== 'string' || comp.material.trim() === '') return
    const id = comp.material
    const path = `${at}.components[${j}].material`
    if (!ctx.materialIds.has(id)) {
      const users = [...ctx.userIds]
      ctx.problems.push({
        path,
        message: `"${id}" is not a known material`,
        fix: `Use a catalogue id: ${catalogue.map((m) => m.id).join(', ')}${users.length > 0 ? `; or one of this study's user materials: ${users.join(', ')}` : ''}; or define "${id}" under user_materials.`
      })
      return
    }
    const m = catalogue.find((x) => x.id === id)
    if (m && ctx.wavelengthsNm.length > 0) {
      const [rlo, rhi] = m.rangeUm
      const slack = 1e-9
      if (lo < rlo * (1 - slack) || hi > rhi * (1 + slack)) {
        ctx.problems.push({
          path,
          message: `the catalogue's ${m.name} index covers ${fmt(rlo * 1000)} to ${fmt(rhi * 1000)} nm, but the study's wavelengths reach from ${fmt(lo * 1000)} to ${fmt(hi * 1000)} nm`,
          fix: `Keep the study's wavelengths within ${fmt(rlo * 1000)}–${fmt(rhi * 1000)} nm, or define a user material whose index covers them.`
        })
      }
    }
  })
}

function checkBins(b: unknown, at: string, ctx: CrossContext): void {
  if (!isObject(b) || !Array.isArray(b.diameters) || !Array.isArray(b.values)) return
  const d = b.diameters
  for (let i = 1; i < d.length; i++) {
    const prev = d[i - 1]
    const cur = d[i]
    if (isNum(prev) && isNum(cur) && !(cur > prev)) {
      ctx.problems.push({
        path: `${at}.diameters[${i}]`,
        message: cur === prev ? `diameter ${fmt(cur)} repeats the one before it (a bin of zero width)` : `diameter ${fmt(cur)} comes after the larger ${fmt(prev)}; bin diameters must ascend`,
        fix: 'Sort the bins by diameter (smallest first) and remove duplicates, keeping each value with its diameter.'
      })
    }
  }
  if (Array.isArray(b.spread) && b.spread.length !== b.values.length) {
    ctx.problems.push({ path: `${at}.spread`, message: `${b.spread.length} spreads for ${b.values.length} values`, fix: 'Give one spread (standard deviation over the averaged rows) per bin value, or leave "spread" out.' })
  }
  if (typeof b.edges === 'boolean') {
    const expected = b.edges ? b.values.length + 1 : b.values.length
    if (d.length !== expected) {
      ctx.problems.push({
        path: `${at}.values`,
        message: b.edges
          ? `${b.values.length} values need ${b.values.length + 1} bin edges, but ${d.length} diameters are given`
          : `${b.values.length} values need ${b.values.length} bin midpoints, but ${d.length} diameters are given`,
        fix: b.edges ? 'With "edges": true give one more diameter than values (the lower edge of each bin and the upper edge of the last).' : 'With "edges": false give one midpoint diameter per value (or set "edges": true if the diameters are the bin edges).'
      })
    }
  }
}

export function crossChecks(doc: unknown, problems: StudyProblem[], warnings: string[]): void {
  if (!isObject(doc)) return
  const userIds = new Set<string>()
  const ctx: CrossContext = {
    problems,
    warnings,
    materialIds: new Set(listMaterials().map((m) => m.id)),
    userIds,
    wavelengthsNm: Array.isArray(doc.wavelengths_nm) ? doc.wavelengths_nm.filter((w): w is number => isNum(w) && w >= wlLo && w <= wlHi) : []
  }

  // The campaign: one file per kind, what the merge needs, a sample that exists. A campaign being set up is
  // not a broken study: these are warnings (the study opens and saves), and the record is not made until they
  // are settled (buildCampaignRecord refuses it with the same words).
  const campaign = campaignSettingsSchema.safeParse(doc.campaign)
  if (doc.campaign !== undefined && campaign.success) {
    const names = Array.isArray(doc.samples) ? doc.samples.filter(isObject).map((x) => x.name).filter((n): n is string => typeof n === 'string') : []
    for (const p of campaignProblems(campaign.data as CampaignSettings, names)) warnings.push(`${p.path}: ${p.message}; ${p.fix}`)
  }

  // Wavelengths ascending.
  if (Array.isArray(doc.wavelengths_nm)) {
    const w = doc.wavelengths_nm
    for (let i = 1; i < w.length; i++) {
      const a = w[i - 1]
      const b = w[i]
      const inRange = (x: unknown): x is number => isNum(x) && x >= wlLo && x <= wlHi
      if (inRange(a) && inRange(b) && !(b > a)) {
        problems.push({
          path: `wavelengths_nm[${i}]`,
          message: b === a ? `wavelength ${fmt(b)} nm appears twice` : `wavelength ${fmt(b)} nm comes after ${fmt(a)} nm; wavelengths must ascend`,
          fix: 'List each wavelength once, from shortest to longest.'
        })
      }
    }
  }

  // User materials: unique ids, not catalogue ids, and a working index at the study's wavelengths.
  if (Array.isArray(doc.user_materials)) {
    doc.user_materials.forEach((u, i) => {
      if (!isObject(u) || typeof u.id !== 'string') return
      const at = `user_materials[${i}]`
      if (ctx.materialIds.has(u.id)) {
        problems.push({
          path: `${at}.id`,
          message: userIds.has(u.id) ? `the id "${u.id}" is used by an earlier user material` : `"${u.id}" is already a catalogue material id`,
          fix: 'Give each user material its own id, different from the catalogue ids.'
        })
        return
      }
      userIds.add(u.id)
      ctx.materialIds.add(u.id)
      const r = userMaterial.safeParse(u)
      if (!r.success || ctx.wavelengthsNm.length === 0) return
      try {
        defineUserMaterial(
          { id: r.data.id, name: r.data.name, densityGcm3: r.data.density_g_cm3, kappa: r.data.kappa, index: r.data.index, source: r.data.source },
          ctx.wavelengthsNm.map((w) => w / 1000)
        )
      } catch (e) {
        if (!(e instanceof InputError)) throw e
        const text = e.message
        const head = `${e.where}: `
        const problem = text.startsWith(head) && text.endsWith(e.fix) ? text.slice(head.length, text.length - e.fix.length).replace(/\.\s*$/, '') : text
        problems.push({ path: `${at}.index`, message: `${e.where}: ${problem}`, fix: e.fix })
      }
    })
  }

  // Samples: compositions, bins, duplicate names.
  if (Array.isArray(doc.samples)) {
    const names = new Map<string, number>()
    doc.samples.forEach((s, i) => {
      if (!isObject(s)) return
      const at = `samples[${i}]`
      checkComposition(s.composition, `${at}.composition`, ctx)
      if (isObject(s.size)) {
        if (s.size.kind === 'modes' && Array.isArray(s.size.modes)) {
          s.size.modes.forEach((m, j) => {
            if (isObject(m) && m.composition !== undefined) checkComposition(m.composition, `${at}.size.modes[${j}].composition`, ctx)
          })
        }
        if (s.size.kind === 'bins') checkBins(s.size.bins, `${at}.size.bins`, ctx)
      }
      if (typeof s.name === 'string' && s.name.trim() !== '') {
        const first = names.get(s.name)
        if (first !== undefined) warnings.push(`${at}.name: "${s.name}" is also the name of samples[${first}]; results will be hard to tell apart`)
        else names.set(s.name, i)
      }
    })
  }

  // Site surface.
  if (isObject(doc.site) && typeof doc.site.surface === 'string' && doc.site.surface.trim() !== '') {
    const id = doc.site.surface
    const albedo = doc.site.surface_albedo
    if (id === 'custom') {
      if (albedo === undefined) {
        problems.push({ path: 'site.surface_albedo', message: 'the surface is "custom" but no surface_albedo is given', fix: 'Add "surface_albedo": the broadband albedo from 0 to 1 (e.g. 0.18 for cropland), or pick a surface id.' })
      }
    } else if (!SURFACE_TYPES.some((t) => t.id === id)) {
      problems.push({
        path: 'site.surface',
        message: `"${id}" is not a known surface`,
        fix: `Use one of: ${SURFACE_TYPES.map((t) => t.id).join(', ')}; or "custom" together with "surface_albedo".`
      })
    } else if (albedo !== undefined) {
      warnings.push(`site.surface_albedo: ignored because the surface is "${id}" (typical albedo ${SURFACE_TYPES.find((t) => t.id === id)?.albedo}); set "surface": "custom" to use your own value`)
    }
  }
}
