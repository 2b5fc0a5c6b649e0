// Every IPC channel has a schema that accepts a good message and refuses a malformed one, naming the bad field.
import { describe, expect, it } from 'vitest'
import { CHANNELS } from '../../src-main/host-api.ts'
import { CHANNEL_SCHEMAS, checkMessage, IpcMessageError, MAX_FILE_NAME, MAX_PATH, MAX_TEXT, type ChannelName } from '../../src-main/ipc-schemas.ts'

const copy = { text: '{"name":"x"}', savedAt: '2025-03-01T12:00:00.000Z', name: 'Valley winter', path: '/data/valley.mote' }
const png = Buffer.from('not really a png').toString('base64')

/** One good message per channel (what the preload sends, or main sends to the page). */
const GOOD: Record<ChannelName, unknown[]> = {
  startUp: [undefined],
  openStudy: [undefined],
  saveStudy: [
    { text: '{}', suggestedName: 'valley.mote', saveAs: false },
    { text: '{}', path: '/data/valley.mote', suggestedName: 'valley.mote', saveAs: true }
  ],
  openSizer: [undefined],
  openInstruments: [undefined],
  readInstrument: ['/data/station/neph.csv'],
  exportFile: [
    { suggestedName: 'valley-results.csv', kind: 'csv', text: 'a,b\n' },
    { suggestedName: 'chart.png', kind: 'png', base64: png }
  ],
  printReport: [{ suggestedName: 'valley-report.pdf' }],
  keepRecovery: [copy, null, { ...copy, path: undefined }],
  setState: [{ title: 'Valley winter', dirty: true, pristine: false }],
  closeWindow: [undefined],
  command: ['save', 'save-and-close', 'cautions'],
  load: [{ name: 'valley.mote', path: '/data/valley.mote', text: '{}' }, { name: 'valley.mote', text: '{}' }]
}

/** Malformed messages per channel: wrong types, missing or extra fields, oversized fields, path traversal. */
const BAD: Record<ChannelName, [string, unknown][]> = {
  startUp: [['an argument', { file: '/etc/passwd' }], ['a string', 'x']],
  openStudy: [['a path', '/etc/passwd'], ['an object', {}]],
  saveStudy: [
    ['text that is not a string', { text: 42, suggestedName: 'a.mote', saveAs: false }],
    ['saveAs as a string', { text: '{}', suggestedName: 'a.mote', saveAs: 'yes' }],
    ['no suggested name', { text: '{}', saveAs: false }],
    ['an extra field', { text: '{}', suggestedName: 'a.mote', saveAs: false, mode: 0o777 }],
    ['oversized text', { text: 'x'.repeat(MAX_TEXT + 1), suggestedName: 'a.mote', saveAs: false }],
    ['an oversized path', { text: '{}', path: `/${'d/'.repeat(MAX_PATH / 2)}a.mote`, suggestedName: 'a.mote', saveAs: false }],
    ['a path climbing out with ..', { text: '{}', path: '/data/studies/../../etc/passwd', suggestedName: 'a.mote', saveAs: false }],
    ['a relative path', { text: '{}', path: 'studies/a.mote', suggestedName: 'a.mote', saveAs: false }],
    ['a relative path with ..', { text: '{}', path: '../a.mote', suggestedName: 'a.mote', saveAs: false }],
    ['a path with a . step', { text: '{}', path: '/data/./a.mote', suggestedName: 'a.mote', saveAs: false }],
    ['a NUL byte in the path', { text: '{}', path: '/data/a.mote\u0000.sh', suggestedName: 'a.mote', saveAs: false }],
    ['a suggested name with a folder', { text: '{}', suggestedName: '../../.bashrc', saveAs: false }],
    ['a suggested name with a backslash', { text: '{}', suggestedName: '..\\evil.mote', saveAs: false }],
    ['a suggested name of ..', { text: '{}', suggestedName: '..', saveAs: false }],
    ['an oversized suggested name', { text: '{}', suggestedName: `${'a'.repeat(MAX_FILE_NAME)}.mote`, saveAs: false }],
    ['an empty suggested name', { text: '{}', suggestedName: '', saveAs: false }],
    ['an array', [{ text: '{}', suggestedName: 'a.mote', saveAs: false }]],
    ['null', null]
  ],
  openSizer: [['a path', '/etc/passwd']],
  openInstruments: [['a path', '/etc/passwd']],
  readInstrument: [['a relative path', 'neph.csv'], ['a path climbing out with ..', '/data/../etc/passwd'], ['an object', { path: '/data/a.csv' }]],
  exportFile: [
    ['both text and base64', { suggestedName: 'a.png', kind: 'png', text: 'x', base64: png }],
    ['neither text nor base64', { suggestedName: 'a.csv', kind: 'csv' }],
    ['an unknown kind', { suggestedName: 'a.sh', kind: 'sh', text: 'x' }],
    ['base64 with foreign characters', { suggestedName: 'a.png', kind: 'png', base64: 'abc$' }],
    ['base64 of a broken length', { suggestedName: 'a.png', kind: 'png', base64: 'abcde' }],
    ['oversized text', { suggestedName: 'a.csv', kind: 'csv', text: 'x'.repeat(MAX_TEXT + 1) }],
    ['a suggested name with a folder', { suggestedName: '/home/user/.profile', kind: 'csv', text: 'x' }],
    ['an extra path field', { suggestedName: 'a.csv', kind: 'csv', text: 'x', path: '/etc/passwd' }],
    ['text that is not a string', { suggestedName: 'a.csv', kind: 'csv', text: ['x'] }]
  ],
  printReport: [
    ['no name', {}],
    ['a name with a folder', { suggestedName: '../report.pdf' }],
    ['an extra field', { suggestedName: 'r.pdf', path: '/tmp/r.pdf' }],
    ['a number', { suggestedName: 7 }]
  ],
  keepRecovery: [
    ['a time that is not ISO 8601', { ...copy, savedAt: 'yesterday' }],
    ['a relative path', { ...copy, path: 'valley.mote' }],
    ['a path climbing out with ..', { ...copy, path: '/data/../../etc/passwd' }],
    ['oversized text', { ...copy, text: 'x'.repeat(MAX_TEXT + 1) }],
    ['an extra field', { ...copy, extra: true }],
    ['no text', { savedAt: copy.savedAt, name: copy.name }],
    ['undefined (null means no copy)', undefined]
  ],
  setState: [
    ['dirty as a string', { title: 'x', dirty: 'true', pristine: false }],
    ['an oversized title', { title: 'x'.repeat(1001), dirty: false, pristine: true }],
    ['an extra field', { title: 'x', dirty: false, pristine: true, closing: true }],
    ['no pristine', { title: 'x', dirty: false }]
  ],
  closeWindow: [['an argument', true]],
  command: [['an unknown command', 'delete-everything'], ['a number', 1], ['an object', { command: 'save' }]],
  load: [
    ['no text', { name: 'a.mote' }],
    ['a name with a folder', { name: '../a.mote', text: '{}' }],
    ['a relative path', { name: 'a.mote', path: 'a.mote', text: '{}' }],
    ['an extra field', { name: 'a.mote', text: '{}', run: 'x' }]
  ]
}

const channelNames = Object.keys(CHANNELS) as ChannelName[]

describe('the IPC schemas', () => {
  it('cover every channel of the host API', () => {
    expect(Object.keys(CHANNEL_SCHEMAS).sort()).toEqual([...channelNames].sort())
    expect(Object.keys(GOOD).sort()).toEqual([...channelNames].sort())
    expect(Object.keys(BAD).sort()).toEqual([...channelNames].sort())
  })

  describe.each(channelNames)('%s', (name) => {
    it.each(GOOD[name].map((m, i) => [i, m] as const))('accepts good message %i', (_i, message) => {
      expect(() => checkMessage(name, message)).not.toThrow()
    })

    it.each(BAD[name])('refuses %s', (_what, message) => {
      expect(() => checkMessage(name, message)).toThrow(IpcMessageError)
    })
  })
})

describe('checkMessage', () => {
  it('names the channel, the field and the rule broken, and what to do', () => {
    const error = (() => {
      try {
        checkMessage('saveStudy', { text: '{}', suggestedName: 'a.mote', saveAs: 'yes' })
      } catch (e) {
        return e as IpcMessageError
      }
      throw new Error('the message was accepted')
    })()
    expect(error.channel).toBe(CHANNELS.saveStudy)
    expect(error.message).toContain(CHANNELS.saveStudy)
    expect(error.message).toMatch(/saveAs: .*boolean/)
    expect(error.message).toMatch(/rebuild/)
  })

  it('explains a path that climbs out of its folder', () => {
    expect(() => checkMessage('saveStudy', { text: '{}', path: '/data/../etc/passwd', suggestedName: 'a.mote', saveAs: false })).toThrow(/path: .*\.\. steps/)
  })

  it('returns the message it checked', () => {
    const message = { title: 'Valley winter', dirty: true, pristine: false }
    expect(checkMessage('setState', message)).toEqual(message)
  })
})
