import { z } from 'zod'
import { EVIDENCE_KINDS } from '../evidence/kinds'
import { recordId } from './fields'

const optionalId = recordId.optional()

/** The form fields sent before the file in a multipart upload. */
export const evidenceFieldsSchema = z.object({
  kind: z.enum(EVIDENCE_KINDS, { error: `must be one of ${EVIDENCE_KINDS.join(', ')}` }),
  courseId: optionalId,
  timingSystemId: optionalId,
  entryId: optionalId,
  attemptId: optionalId,
  runId: optionalId,
  inspectionId: optionalId,
  itemKey: z.string().max(60).optional(),
})
export type EvidenceFieldsInput = z.infer<typeof evidenceFieldsSchema>

export const evidenceQuerySchema = z.object({
  kind: z.enum(EVIDENCE_KINDS).optional(),
  attemptId: optionalId,
  runId: optionalId,
  entryId: optionalId,
})
export type EvidenceQuery = z.infer<typeof evidenceQuerySchema>

export const hashParams = z.object({
  id: recordId,
  sha: z.string().regex(/^[0-9a-f]{64}$/, { error: 'must be a SHA-256 in hex' }),
})
