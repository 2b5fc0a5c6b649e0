// Fields named as the screen names them in problem messages, instead of the study format's paths.
import { describe, expect, it } from 'vitest'
import { demoStudy } from '../../src-core/index.ts'
import { fieldLabel, screenName } from '../../src-renderer/edit/fieldNames.ts'

describe('screen names of study fields', () => {
  const study = demoStudy()

  it('names a sample by its name, a mode and a component by their numbers on screen, a field by its label', () => {
    expect(screenName(study, 'samples[2].size.modes[0].median_um')).toBe('Coastal haze day › mode 1 › median diameter')
    expect(screenName(study, 'samples[0].size.modes[1].gsd')).toBe('Winter wood smoke › mode 2 › σg')
    expect(screenName(study, 'samples[1].composition.components[0].volume_fraction')).toBe('Quarry dust event › composition › component 1 › volume fraction')
    expect(screenName(study, 'samples[2].layer.depth_m')).toBe('Coastal haze day › layer depth')
    expect(screenName(study, 'site.cloud_fraction')).toBe('Site › cloud fraction')
    expect(screenName(study, 'wavelengths_nm[3]')).toBe(`Wavelengths › ${study.wavelengths_nm[3]} nm`)
  })

  it('never returns the path itself for a field of the study format', () => {
    for (const path of ['samples[0].size.modes[0].number_cm3', 'samples[0].rh_percent', 'samples[0].composition.kappa', 'samples[4].size.modes[2].composition.components[1].material']) {
      const name = screenName(study, path)
      expect(name).not.toMatch(/\[|_|\.(?! )/)
    }
  })

  it('gives the field alone for a message beside it', () => {
    expect(fieldLabel('samples[0].size.modes[0].number_cm3')).toBe('number concentration')
    expect(fieldLabel('samples[3].composition.components[1].volume_fraction')).toBe('volume fraction')
  })
})
