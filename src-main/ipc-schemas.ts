// The zod schemas main checks every message on every IPC channel against (the API itself is in host-api.ts).
import { isAbsolute } from 'node:path'
import { z } from 'zod'
import { CHANNELS, MENU_COMMANDS } from './host-api.ts'

/** Studies and exports are text of at most this many characters (a study with large sizer tables is far smaller). */
export const MAX_TEXT = 50_000_000
export const MAX_PATH = 4096
export const MAX_FILE_NAME = 255

const CONTROL_CHARACTERS = /[\u0000-\u001f\u007f]/

/** A file name without any folder: what a save dialog suggests. */
export const fileName = z
  .string()
  .min(1)
  .max(MAX_FILE_NAME)
  .refine((s) => !CONTROL_CHARACTERS.test(s), { message: 'a file name may not contain control characters' })
  .refine((s) => !/[\\/]/.test(s), { message: 'give a file name without a folder (no / or \\)' })
  .refine((s) => s !== '.' && s !== '..', { message: 'give a file name, not . or ..' })

/** An absolute path with no `.` or `..` steps: a place a dialog or an opened file gave, never one built from parts. */
export const absolutePath = z
  .string()
  .min(1)
  .max(MAX_PATH)
  .refine((s) => !CONTROL_CHARACTERS.test(s), { message: 'a path may not contain control characters' })
  .refine((s) => isAbsolute(s), { message: 'give an absolute path (as the file dialogs return)' })
  .refine((s) => !s.split(/[\\/]/).some((step) => step === '..' || step === '.'), { message: 'a path may not contain . or .. steps' })

const text = z.string().max(MAX_TEXT)

export const saveStudyRequest = z.strictObject({
  text,
  path: absolutePath.optional(),
  suggestedName: fileName,
  saveAs: z.boolean()
})

export const exportFileRequest = z
  .strictObject({
    suggestedName: fileName,
    kind: z.enum(['csv', 'json', 'png', 'pdf', 'study']),
    text: text.optional(),
    base64: z
      .string()
      .max(MAX_TEXT)
      .regex(/^[A-Za-z0-9+/]*={0,2}$/, { message: 'base64 text may hold only A–Z, a–z, 0–9, +, / and trailing =' })
      .refine((s) => s.length % 4 === 0, { message: 'base64 text has a length that is a multiple of 4' })
      .optional()
  })
  .refine((r) => (r.text === undefined) !== (r.base64 === undefined), { message: 'give text or base64, not both and not neither' })

export const printReportRequest = z.strictObject({ suggestedName: fileName })

export const recoveryCopy = z.strictObject({
  text,
  savedAt: z.iso.datetime({ message: 'savedAt is an ISO 8601 time in UTC, e.g. 2025-03-01T12:00:00.000Z' }),
  name: z.string().max(1000),
  path: absolutePath.optional()
})
export const keepRecoveryRequest = recoveryCopy.nullable()

export const setStateRequest = z.strictObject({
  title: z.string().max(1000),
  dirty: z.boolean(),
  pristine: z.boolean()
})

export const noArguments = z.undefined()

/** Main → renderer: a menu command. */
export const menuCommandMessage = z.enum(MENU_COMMANDS)

/** Main → renderer: a study file for the window to load. */
export const openedFileMessage = z.strictObject({ name: fileName, path: absolutePath.optional(), text })

export type ChannelName = keyof typeof CHANNELS

/** The schema of every channel in host-api.ts; `satisfies` makes a new channel without a schema a compile error. */
export const CHANNEL_SCHEMAS = {
  startUp: noArguments,
  openStudy: noArguments,
  saveStudy: saveStudyRequest,
  openSizer: noArguments,
  openInstruments: noArguments,
  readInstrument: absolutePath,
  exportFile: exportFileRequest,
  printReport: printReportRequest,
  keepRecovery: keepRecoveryRequest,
  setState: setStateRequest,
  closeWindow: noArguments,
  command: menuCommandMessage,
  load: openedFileMessage
} satisfies Record<ChannelName, z.ZodType>

/** The message a channel carries, once checked. */
export type ChannelMessage<N extends ChannelName> = z.infer<(typeof CHANNEL_SCHEMAS)[N]>

/** A message that does not match its channel's schema. */
export class IpcMessageError extends Error {
  readonly channel: string
  constructor(channel: string, problems: string[]) {
    super(
      `Message refused on ${channel}: ${problems.join('; ')}. ` +
        'The window and the main process disagree about the host API (src-main/host-api.ts, ipc-schemas.ts): rebuild both from the same sources.'
    )
    this.name = 'IpcMessageError'
    this.channel = channel
  }
}

function describeIssues(error: z.ZodError): string[] {
  return error.issues.map((issue) => `${issue.path.length ? issue.path.join('.') : 'the message'}: ${issue.message}`)
}

/** The message checked against the schema of `name`, or an IpcMessageError saying which field is wrong and why. */
export function checkMessage<N extends ChannelName>(name: N, raw: unknown): ChannelMessage<N> {
  const schema: z.ZodType = CHANNEL_SCHEMAS[name]
  const parsed = schema.safeParse(raw)
  if (!parsed.success) throw new IpcMessageError(CHANNELS[name], describeIssues(parsed.error))
  return parsed.data as ChannelMessage<N>
}
