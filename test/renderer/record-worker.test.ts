// The station record's worker (src-renderer/campaign/worker.ts) driven in Node by the messages a web page sends it:
// a sizer file's bytes come first and are read ahead as the kind the page guessed (readSizerBytes); the record asked
// for then takes that reading, or, when the file is asked for as another kind, reads the bytes it kept as that kind;
// either way the record is the one src-core builds from the files' texts. The next record on the same worker (a
// parameter changed) reads no file from its blob: it takes the measured files' readings it kept and reads the sizer
// again from its bytes.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { buildCampaignRecord, demoStudy, recordCsv, type CampaignFileKind, type CampaignSettings } from '../../src-core/index.ts'
import type { FromRecordWorker, RecordWorkerInput, ToRecordWorker } from '../../src-renderer/campaign/worker.ts'
import { repo } from '../cli/helpers.ts'

const posted: FromRecordWorker[] = []
let send: (m: ToRecordWorker) => Promise<void>
beforeAll(async () => {
  const self = { postMessage: (m: FromRecordWorker) => posted.push(m), onmessage: undefined as unknown as (e: { data: ToRecordWorker }) => Promise<void> }
  ;(globalThis as unknown as { self: typeof self }).self = self
  await import('../../src-renderer/campaign/worker.ts')
  send = (m) => self.onmessage({ data: m })
})

const file = (n: string) => join(repo, 'resources/field', n)
const text = (n: string) => readFileSync(file(n), 'utf8')
const study = demoStudy()
const settings: CampaignSettings = { files: [], sample: study.samples[0].name, wavelength_nm: 550, shape_factor: 1 }
/** A blob that must not be read: the worker holds the file's bytes already. */
const unread = { arrayBuffer: () => Promise.reject(new Error('the blob was read although the bytes were held')) } as unknown as Blob

/** The lengths of the inputs TextDecoder decoded meanwhile, in bytes. */
async function decodedDuring(f: () => Promise<void>): Promise<number[]> {
  const decode = TextDecoder.prototype.decode
  const lengths: number[] = []
  TextDecoder.prototype.decode = function (this: TextDecoder, input?: AllowSharedBufferSource, options?: TextDecodeOptions) {
    lengths.push(input?.byteLength ?? 0)
    return decode.call(this, input, options)
  }
  try {
    await f()
  } finally {
    TextDecoder.prototype.decode = decode
  }
  return lengths
}

/** Asks the worker for a record; its message, and the lengths of what TextDecoder decoded meanwhile. */
async function askRecord(job: number, s: CampaignSettings, inputs: RecordWorkerInput[]): Promise<Extract<FromRecordWorker, { type: 'done' }> & { decoded: number[] }> {
  const decoded = await decodedDuring(() => send({ type: 'record', job, settings: s, study, inputs }))
  const done = posted.find((m) => m.job === job && m.type !== 'progress')
  if (done?.type !== 'done') throw new Error(`the record failed: ${JSON.stringify(done)}`)
  return { ...done, decoded }
}

async function recordAs(kind: CampaignFileKind, serial: number, job: number): Promise<Extract<FromRecordWorker, { type: 'done' }> & { decoded: number[]; size: number }> {
  const bytes = new Uint8Array(readFileSync(file('campaign-mobility.csv'))).buffer
  const size = bytes.byteLength
  await send({ type: 'bytes', serial, name: 'campaign-mobility.csv', kind: 'mobility', bytes })
  const done = await askRecord(job, settings, [
    { kind, name: 'campaign-mobility.csv', serial, blob: unread },
    { kind: 'scattering', name: 'campaign-nephelometer.csv', serial: serial + 1, text: text('campaign-nephelometer.csv') },
    { kind: 'absorption', name: 'campaign-absorption.csv', serial: serial + 2, text: text('campaign-absorption.csv') }
  ])
  return { ...done, size }
}

const expected = (kind: CampaignFileKind, s = settings) =>
  buildCampaignRecord(
    [
      { kind, name: 'campaign-mobility.csv', text: text('campaign-mobility.csv') },
      { kind: 'scattering', name: 'campaign-nephelometer.csv', text: text('campaign-nephelometer.csv') },
      { kind: 'absorption', name: 'campaign-absorption.csv', text: text('campaign-absorption.csv') }
    ],
    s,
    study
  )

describe('the record worker', () => {
  it('takes the sizer as read ahead from its bytes, as the kind guessed: the record of the texts', { timeout: 60_000 }, async () => {
    const done = await recordAs('mobility', 10, 1)
    expect(done.decoded).not.toContain(done.size) // the reading ahead taken, the file not decoded again
    const want = expected('mobility')
    expect(done.build.files).toEqual(want.files)
    expect(recordCsv(done.build.record!)).toBe(recordCsv(want.record!))
  })

  it('reads the held bytes again for a sizer asked for as another kind: the record of the texts read as that kind', { timeout: 60_000 }, async () => {
    const done = await recordAs('merged', 20, 2)
    expect(done.decoded).not.toContain(done.size) // read from the bytes, not decoded whole
    const want = expected('merged')
    expect(done.build.files[0].notes.join(' ')).toMatch(/merged size distribution: 62 bins/)
    expect(done.build.files).toEqual(want.files)
    expect(recordCsv(done.build.record!)).toBe(recordCsv(want.record!))
  })

  it('asked for the next record (another wavelength, then another kind of sizer), reads no file from its blob: the records of the texts', { timeout: 60_000 }, async () => {
    await recordAs('mobility', 30, 3)
    // the same serials, every file now as a blob that must not be read
    const again = (job: number, kind: CampaignFileKind, s: CampaignSettings) =>
      askRecord(job, s, [
        { kind, name: 'campaign-mobility.csv', serial: 30, blob: unread },
        { kind: 'scattering', name: 'campaign-nephelometer.csv', serial: 31, blob: unread },
        { kind: 'absorption', name: 'campaign-absorption.csv', serial: 32, blob: unread }
      ])
    const at700 = { ...settings, wavelength_nm: 700 }
    const size = readFileSync(file('campaign-mobility.csv')).byteLength
    for (const [job, kind, s] of [[4, 'mobility', at700], [5, 'mobility', settings], [6, 'merged', at700]] as const) {
      const done = await again(job, kind, s)
      expect(done.decoded).not.toContain(size)
      const w = expected(kind, s)
      // the summaries as a first record's: the notes a record adds are not carried into the next
      expect(done.build.files).toEqual(w.files)
      expect(recordCsv(done.build.record!)).toBe(recordCsv(w.record!))
    }
  })
})
