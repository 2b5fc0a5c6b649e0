/**
 * The schemas the main process checks every renderer message against (see host-api.ts for the API).
 */
import { z } from 'zod'

/** Studies and exports are text of at most this many characters (a study with large sizer tables is far smaller). */
export const MAX_TEXT = 50_000_000
const fileName = z.string().min(1).max(255)
const text = z.string().max(MAX_TEXT)

export const saveStudyRequest = z.strictObject({
  text,
  path: z.string().min(1).max(4096).optional(),
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
      .regex(/^[A-Za-z0-9+/=]*$/)
      .optional()
  })
  .refine((r) => (r.text === undefined) !== (r.base64 === undefined), { message: 'give text or base64, not both' })

export const printReportRequest = z.strictObject({ suggestedName: fileName })

export const recoveryCopy = z.strictObject({
  text,
  savedAt: z.string().max(64),
  name: z.string().max(1000),
  path: z.string().max(4096).optional()
})
export const keepRecoveryRequest = recoveryCopy.nullable()

export const setStateRequest = z.strictObject({
  title: z.string().max(1000),
  dirty: z.boolean(),
  pristine: z.boolean()
})

export const noArguments = z.undefined()

