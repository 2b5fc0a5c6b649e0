// A length field (a median diameter): the cell shows the number with its unit, "45 nm" or "2.5 µm". A bare number
// typed into it means the unit the cell showed; a number typed with a unit ("2.5 µm") is read in it, and the cell
// then keeps that unit (the person's own choice is not rewritten into another). A length above the largest accepted
// is refused in the unit it was typed in.
import { readLength, type LengthOptions } from '../../src-core/index.ts'
import { num } from '../format.ts'
import { Field, type FieldProps } from './Field.tsx'

export type LengthUnit = 'nm' | 'um'

export const UNIT_SHOWN: Record<LengthUnit, string> = { nm: 'nm', um: 'µm' }

/** The unit each length field shows, by field path, once something was typed into it. */
const chosen = new Map<string, LengthUnit>()

/** The unit a field shows: the one it was last typed in, else nm below 1 µm and µm from 1 µm. */
export function unitOf(path: string, um: number): LengthUnit {
  return chosen.get(path) ?? (um < 1 ? 'nm' : 'um')
}

/** Reads a length typed into the field at `path`, which shows `unit`; a nm or µm written with it becomes the field's unit. */
export function readLengthAt(path: string, unit: LengthUnit, where: string, options: Omit<LengthOptions, 'defaultUnit'> = {}): (t: string) => number {
  return (t) => {
    // the unit is settled before the range is checked, so a refusal speaks of the unit typed; a bare number keeps
    // the field in the unit it showed (else a value crossing 1 µm while typed would switch the unit under the typing)
    const typed = readLength(t, where, { defaultUnit: unit })
    chosen.set(path, typed.unit === 'nm' || typed.unit === 'um' ? typed.unit : unit)
    return readLength(t, where, { ...options, defaultUnit: unit }).um
  }
}

/** `um` in `unit`, as the field writes it: "45 nm", "2.5 µm". */
export const writeLength = (um: number, unit: LengthUnit): string => `${num(unit === 'nm' ? um * 1000 : um, 5)} ${UNIT_SHOWN[unit]}`

export function LengthField(p: Omit<FieldProps<number>, 'read' | 'write' | 'hint'> & { where: string; options?: Omit<LengthOptions, 'defaultUnit'>; kind?: string }) {
  const unit = unitOf(p.path, p.value)
  const { where, options, kind, ...rest } = p
  return (
    <Field
      {...rest}
      read={readLengthAt(p.path, unit, where, options)}
      write={(v) => writeLength(v, unitOf(p.path, v))}
      hint={kind}
      title={p.title ?? `A number alone is in ${UNIT_SHOWN[unit]}, the unit shown; type a unit to give it in another ("150 nm", "2.5 µm").`}
    />
  )
}
