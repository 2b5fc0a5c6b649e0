/**
 * The demo study: an invented scenario. Harrowmere Valley, its monitoring station and the Tollbridge
 * aerosol lab do not exist; every number below is invented demo data, chosen only to be physically
 * plausible (typical values from the aerosol literature, not measurements).
 * resources/demo.mote is this object written by `serializeStudy` (regenerate with `motebench demo --out resources`).
 */
import { STUDY_FORMAT, STUDY_VERSION, type Study } from './model.ts'

const INVENTED = 'Invented demo data, not a measurement.'

/** A fresh copy of the demo study (callers may change it). */
export function demoStudy(): Study {
  return {
    format: STUDY_FORMAT,
    version: STUDY_VERSION,
    name: 'Harrowmere Valley winter campaign (demo)',
    notes:
      'Invented demo data: Harrowmere Valley station and the Tollbridge aerosol lab are fictional. Five samples from an imagined winter at a mid-latitude valley station, to show what Motebench does. Mode medians are count medians for modes given by number, volume medians for modes given by volume, mass medians for modes given by mass.',
    wavelengths_nm: [350, 400, 450, 500, 550, 600, 700, 800, 1000, 1250, 1600, 2000, 2500],
    site: {
      name: 'Harrowmere Valley station (fictional)',
      latitude_deg: 47.2,
      day_of_year: 24,
      cloud_fraction: 0.6,
      transmittance: 0.76,
      surface: 'cropland'
    },
    verdict_margin_w_m2: 0.5,
    samples: [
      {
        name: 'Winter wood smoke',
        notes: `${INVENTED} Evening residential wood burning trapped under a valley inversion; internally mixed organic matter, brown carbon and some black carbon.`,
        rh_percent: 72,
        rh_history: 'rising',
        temperature_k: 268,
        layer: { kind: 'depth', depth_m: 400 },
        composition: {
          components: [
            { material: 'organic-matter', volume_fraction: 0.8 },
            { material: 'brown-carbon', volume_fraction: 0.14 },
            { material: 'black-carbon', volume_fraction: 0.06 }
          ],
          mixing: 'volume-average'
        },
        size: {
          kind: 'modes',
          modes: [
            { by: 'number', name: 'Aitken', number_cm3: 6000, median_um: 0.045, gsd: 1.6 },
            { by: 'number', name: 'accumulation', number_cm3: 9000, median_um: 0.13, gsd: 1.7 }
          ]
        }
      },
      {
        name: 'Quarry dust event',
        notes: `${INVENTED} Afternoon gusts lift dust from the (fictional) Cobbet Hill quarry; a coarse and a fine mineral dust mode given by mass (mass median diameters).`,
        rh_percent: 45,
        rh_history: 'rising',
        temperature_k: 276,
        layer: { kind: 'depth', depth_m: 1500 },
        composition: {
          components: [{ material: 'mineral-dust', volume_fraction: 1 }],
          mixing: 'volume-average'
        },
        size: {
          kind: 'modes',
          modes: [
            { by: 'mass', name: 'fine dust', mass_ug_m3: 22, median_um: 1.2, gsd: 1.8 },
            { by: 'mass', name: 'coarse dust', mass_ug_m3: 140, median_um: 4.5, gsd: 2 }
          ]
        }
      },
      {
        name: 'Coastal haze day',
        notes: `${INVENTED} Moist westerly air carries sea salt and sulfate up the valley; the haze formed from fog, so the salts are on the falling (efflorescence) branch.`,
        rh_percent: 82,
        rh_history: 'falling',
        temperature_k: 279,
        layer: { kind: 'scale-height', scale_height_m: 1200 },
        composition: {
          components: [
            { material: 'ammonium-sulfate', volume_fraction: 0.7 },
            { material: 'sea-salt', volume_fraction: 0.3 }
          ],
          mixing: 'volume-average'
        },
        size: {
          kind: 'modes',
          modes: [
            { by: 'number', name: 'accumulation', number_cm3: 1800, median_um: 0.16, gsd: 1.6 },
            {
              by: 'volume',
              name: 'sea-salt coarse',
              volume_um3_cm3: 18,
              median_um: 2.5,
              gsd: 2,
              composition: { components: [{ material: 'sea-salt', volume_fraction: 1 }], mixing: 'volume-average' }
            }
          ]
        }
      },
      {
        name: 'Aged soot with sulfate coating',
        notes: `${INVENTED} Diesel soot aged for a day over the valley floor: a black-carbon core inside an ammonium-sulfate shell.`,
        rh_percent: 55,
        rh_history: 'rising',
        temperature_k: 271,
        layer: { kind: 'depth', depth_m: 1500 },
        composition: {
          components: [
            { material: 'black-carbon', volume_fraction: 0.15 },
            { material: 'ammonium-sulfate', volume_fraction: 0.85 }
          ],
          mixing: 'core-shell'
        },
        size: {
          kind: 'modes',
          modes: [{ by: 'number', name: 'coated soot', number_cm3: 3000, median_um: 0.15, gsd: 1.5 }]
        }
      },
      {
        name: 'Humid sulfate–nitrate episode',
        notes: `${INVENTED} A stagnant, humid spell: ammonium sulfate and ammonium nitrate grow in an Aitken, an accumulation and a droplet mode.`,
        rh_percent: 85,
        rh_history: 'rising',
        temperature_k: 274,
        layer: { kind: 'depth', depth_m: 1500 },
        composition: {
          components: [
            { material: 'ammonium-sulfate', volume_fraction: 0.55 },
            { material: 'ammonium-nitrate', volume_fraction: 0.45 }
          ],
          mixing: 'volume-average'
        },
        size: {
          kind: 'modes',
          modes: [
            { by: 'number', name: 'Aitken', number_cm3: 4000, median_um: 0.05, gsd: 1.6 },
            { by: 'number', name: 'condensation', number_cm3: 2500, median_um: 0.2, gsd: 1.5 },
            { by: 'number', name: 'droplet', number_cm3: 300, median_um: 0.55, gsd: 1.4 }
          ]
        }
      }
    ]
  }
}
