// The lognormal modes of a sample: amount (by number, volume or mass), median diameter and GSD, and what each is
// made of: the sample's composition, or one of its own (modes of different compositions form an external mixture).
import { MAX_MEDIAN_UM, readAmount, type ModeSpec, type UserMaterialSpec } from '../../src-core/index.ts'
import { CompositionEditor } from './CompositionEditor.tsx'
import { num } from '../format.ts'
import { LengthField } from './LengthField.tsx'
import { editSample } from '../state/actions.ts'
import { ErrorRow, Field, readNumber } from './Field.tsx'
import { Fragment } from 'preact'

/** The three forms a mode is given in: amount symbol and unit, and the median the diameter is. */
export const BY = {
  number: { label: 'number', amount: 'N', unit: 'cm⁻³', median: 'CMD', key: 'number_cm3', fresh: 1000 },
  volume: { label: 'volume', amount: 'V', unit: 'µm³ cm⁻³', median: 'VMD', key: 'volume_um3_cm3', fresh: 10 },
  mass: { label: 'mass', amount: 'M', unit: 'µg m⁻³', median: 'MMD', key: 'mass_ug_m3', fresh: 10 }
} as const

/** Units an amount may also be typed in, for the field's tooltip. */
const AMOUNT_EXAMPLE = { number: '6e9 m⁻³, 6000 /cm3', volume: '3 um3/cm3', mass: '0.14 mg/m3, 500 ng/m3' } as const

export const amountOf = (m: ModeSpec): number => (m.by === 'number' ? m.number_cm3 : m.by === 'volume' ? m.volume_um3_cm3 : m.mass_ug_m3)

export function ModesTable(p: { id: string; index: number; modes: ModeSpec[]; userMaterials: UserMaterialSpec[] }) {
  const base = `samples[${p.index}].size.modes`
  return (
    <div class="modes">
      <table class="grid-table modes-table">
        <caption class="sr-only">Lognormal modes</caption>
        <thead>
          <tr>
            <th scope="col">Mode</th>
            <th scope="col" title="How the mode's amount is given">Given by</th>
            <th scope="col" title="Number (cm⁻³), volume (µm³ cm⁻³) or mass (µg m⁻³) concentration; a number alone is in the unit the cell shows, or type a unit (0.14 mg/m3, 6e9 m⁻³)">Amount</th>
            <th scope="col" title="Median diameter: count (CMD), volume (VMD) or mass (MMD) median; a number alone is in the unit the cell shows (nm or µm), or type a unit (150 nm, 2.5 µm)">
              Median D
            </th>
            <th scope="col" title="Geometric standard deviation σg (> 1)">σg</th>
            <th scope="col" title="Ticked: the mode has a composition of its own (an external mixture of differently made modes)">Own mix</th>
            <th scope="col">
              <span class="sr-only">Remove</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {p.modes.map((m, j) => {
            const by = BY[m.by]
            const path = `${base}[${j}]`
            return (
              <Fragment key={j}>
              <tr data-mode={j}>
                <td>
                  <input
                    type="text"
                    class="mode-name"
                    aria-label={`Name of mode ${j + 1}`}
                    value={m.name ?? ''}
                    placeholder={`mode ${j + 1}`}
                    onInput={(e) => {
                      const v = (e.target as HTMLInputElement).value
                      editSample(p.id, (s) => {
                        if (s.size.kind === 'modes') s.size.modes[j].name = v || undefined
                      }, `${path}.name`)
                    }}
                  />
                </td>
                <td>
                  <select
                    aria-label={`Mode ${j + 1} given by`}
                    value={m.by}
                    onChange={(e) => {
                      const v = (e.target as HTMLSelectElement).value as ModeSpec['by']
                      editSample(p.id, (s) => {
                        if (s.size.kind !== 'modes') return
                        const old = s.size.modes[j]
                        const common = { median_um: old.median_um, gsd: old.gsd, name: old.name, composition: old.composition }
                        s.size.modes[j] =
                          v === 'number'
                            ? { by: 'number', number_cm3: BY.number.fresh, ...common }
                            : v === 'volume'
                              ? { by: 'volume', volume_um3_cm3: BY.volume.fresh, ...common }
                              : { by: 'mass', mass_ug_m3: BY.mass.fresh, ...common }
                      })
                    }}
                  >
                    <option value="number">number</option>
                    <option value="volume">volume</option>
                    <option value="mass">mass</option>
                  </select>
                </td>
                <td class="amount">
                  <Field
                    bare
                    path={`${path}.${by.key}`}
                    label={`Mode ${j + 1} ${by.amount} in ${by.unit}`}
                    value={amountOf(m)}
                    read={(t) => readAmount(t, `${by.label} concentration`, m.by).value}
                    write={(v) => num(v, 6)}
                    hint={by.unit}
                    title={`A number alone is in ${by.unit}, the unit shown; type a unit to give it in another (${AMOUNT_EXAMPLE[m.by]}).`}
                    commit={(v) =>
                      editSample(p.id, (s) => {
                        if (s.size.kind !== 'modes') return
                        const mm = s.size.modes[j] as Record<string, unknown>
                        mm[by.key] = v
                      }, `${path}.amount`)
                    }
                  />
                </td>
                <td>
                  <LengthField
                    bare
                    path={`${path}.median_um`}
                    label={`Mode ${j + 1} ${by.median}`}
                    value={m.median_um}
                    where={`${by.median}`}
                    options={{ max_um: MAX_MEDIAN_UM, what: 'a median diameter' }}
                    kind={by.median}
                    commit={(v) =>
                      editSample(p.id, (s) => {
                        if (s.size.kind === 'modes') s.size.modes[j].median_um = v
                      }, `${path}.median`)
                    }
                  />
                </td>
                <td>
                  <Field
                    bare
                    path={`${path}.gsd`}
                    label={`Mode ${j + 1} geometric standard deviation`}
                    value={m.gsd}
                    read={readNumber('σg')}
                    write={(v) => num(v, 4)}
                    commit={(v) =>
                      editSample(p.id, (s) => {
                        if (s.size.kind === 'modes') s.size.modes[j].gsd = v
                      }, `${path}.gsd`)
                    }
                  />
                </td>
                <td>
                  <input
                    type="checkbox"
                    class="made-of"
                    aria-label={`Mode ${j + 1} has a composition of its own`}
                    title="Ticked: this mode has a composition of its own (an external mixture); else it is made of the sample's composition"
                    checked={!!m.composition}
                    data-path={`${path}.composition`}
                    onChange={(e) => {
                      const own = (e.target as HTMLInputElement).checked
                      editSample(p.id, (s) => {
                        if (s.size.kind !== 'modes') return
                        const mm = s.size.modes[j]
                        // an own composition starts as a copy of the sample's, to be changed from there
                        if (own) mm.composition = structuredClone(s.composition)
                        else delete mm.composition
                      })
                    }}
                  />
                </td>
                <td>
                  <button
                    type="button"
                    class="small ghost"
                    aria-label={`Remove mode ${j + 1}`}
                    title="Remove this mode"
                    disabled={p.modes.length <= 1}
                    onClick={() =>
                      editSample(p.id, (s) => {
                        if (s.size.kind === 'modes') s.size.modes.splice(j, 1)
                      })
                    }
                  >
                    ✕
                  </button>
                </td>
              </tr>
              <ErrorRow span={7} paths={[`${path}.${by.key}`, `${path}.median_um`, `${path}.gsd`, path]} />
              {m.composition && (
                <tr class="mode-composition" data-mode-composition={j}>
                  <td colSpan={7}>
                    <p class="mode-composition-head">Own composition of {m.name || `mode ${j + 1}`}</p>
                    <CompositionEditor id={p.id} index={p.index} mode={j} composition={m.composition} userMaterials={p.userMaterials} />
                  </td>
                </tr>
              )}
              </Fragment>
            )
          })}
        </tbody>
      </table>
      <button
        type="button"
        class="small"
        onClick={() =>
          editSample(p.id, (s) => {
            if (s.size.kind === 'modes') s.size.modes.push({ by: 'number', name: `mode ${s.size.modes.length + 1}`, number_cm3: 1000, median_um: 0.1, gsd: 1.6 })
          })
        }
      >
        Add mode
      </button>
    </div>
  )
}
