// Humidity (with which branch of the hysteresis), temperature and the layer the sample fills.
import { parseLength, parseTemperature, type LayerSpec, type Sample } from '../../src-core/index.ts'
import { num } from '../format.ts'
import { editSample } from '../state/actions.ts'
import { Field, readNumber, readPercent } from './Field.tsx'

const LAYER: Record<LayerSpec['kind'], { label: string; key: string; hint: string; fresh: number }> = {
  depth: { label: 'Uniform depth', key: 'depth_m', hint: 'm (or "1.5 km")', fresh: 1000 },
  'scale-height': { label: 'Scale height', key: 'scale_height_m', hint: 'm (or "1.2 km")', fresh: 1200 },
  'optical-depth': { label: 'AOD at 550 nm', key: 'aod_550', hint: 'optical depth', fresh: 0.1 }
}

const layerValue = (l: LayerSpec): number => (l.kind === 'depth' ? l.depth_m : l.kind === 'scale-height' ? l.scale_height_m : l.aod_550)

/** Metres from "1500", "1,500", "1500 m" or "1.5 km" (a number alone is in m, the unit shown). */
const readMetres = (what: string) => (t: string) => {
  const s = t.trim()
  if (!/[a-df-zµμ]/i.test(s)) return readNumber(what)(s) // digits, separators and an exponent only
  return parseLength(s, what) / 1e6
}

export function Conditions(p: { id: string; index: number; sample: Sample }) {
  const base = `samples[${p.index}]`
  const s = p.sample
  const l = LAYER[s.layer.kind]
  return (
    <div class="conditions">
      <div class="row wrap">
        <Field
          path={`${base}.rh_percent`}
          label="Relative humidity"
          value={s.rh_percent}
          read={readPercent('relative humidity')}
          write={(v) => num(v, 4)}
          hint="%"
          title="Relative humidity in percent: 85 or 85 %"
          width="4em"
          commit={(v) => editSample(p.id, (x) => (x.rh_percent = v), 'rh')}
        />
        <label class="field">
          <span title="Salts that dried from droplets stay wet below their deliquescence humidity (efflorescence branch)">Humidity history</span>
          <select value={s.rh_history} onChange={(e) => editSample(p.id, (x) => (x.rh_history = (e.target as HTMLSelectElement).value as Sample['rh_history']))}>
            <option value="rising">rising (particles were dry)</option>
            <option value="falling">falling (particles were wet)</option>
          </select>
        </label>
        <Field
          path={`${base}.temperature_k`}
          label="Temperature"
          value={s.temperature_k}
          read={(t) => (t.trim() === '' ? undefined : parseTemperature(t, 'temperature'))}
          write={(v) => (v === undefined ? '' : `${num(v, 5)} K`)}
          hint="K, degC"
          width="5em"
          commit={(v) => editSample(p.id, (x) => (v === undefined ? delete x.temperature_k : (x.temperature_k = v)), 'temperature')}
        />
      </div>
      <div class="row wrap">
        <label class="field">
          <span>Layer given by</span>
          <select
            value={s.layer.kind}
            data-path={`${base}.layer.kind`}
            onChange={(e) => {
              const k = (e.target as HTMLSelectElement).value as LayerSpec['kind']
              editSample(p.id, (x) => {
                x.layer = k === 'depth' ? { kind: k, depth_m: LAYER.depth.fresh } : k === 'scale-height' ? { kind: k, scale_height_m: LAYER['scale-height'].fresh } : { kind: k, aod_550: LAYER['optical-depth'].fresh }
              })
            }}
          >
            <option value="depth">uniform depth</option>
            <option value="scale-height">scale height (exponential)</option>
            <option value="optical-depth">AOD at 550 nm</option>
          </select>
        </label>
        <Field
          path={`${base}.layer.${l.key}`}
          label={l.label}
          value={layerValue(s.layer)}
          read={s.layer.kind === 'optical-depth' ? readNumber('AOD') : readMetres(l.label)}
          write={(v) => num(v, 5)}
          hint={l.hint}
          width="5em"
          commit={(v) =>
            editSample(p.id, (x) => {
              ;(x.layer as Record<string, unknown>)[l.key] = v
            }, `layer-${l.key}`)
          }
        />
      </div>
    </div>
  )
}
