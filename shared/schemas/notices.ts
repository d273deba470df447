import { z } from 'zod'
import './messages'
import { signSheetSchema } from './event-day'
import { recordId } from './fields'

/** An official notice, signed by its issuer: what it says, and the attempt it concerns where it concerns one. */
export const noticeSchema = signSheetSchema.extend({
  title: z.string().trim().min(3, { error: 'give the notice a title' }).max(160),
  body: z.string().trim().min(3, { error: 'write what the notice says' }).max(4000),
  attemptId: recordId.optional(),
})
export type NoticeInput = z.infer<typeof noticeSchema>
