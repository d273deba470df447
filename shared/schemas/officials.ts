import { z } from 'zod'
import './messages'
import { OFFICIAL_FUNCTIONS } from '../constants'
import { recordId } from './fields'

const day = z.iso.date({ error: 'must be a date, YYYY-MM-DD' })

/** The event's permit from its sanctioning body. */
export const permitSchema = z.object({
  issuingBody: z.string().trim().min(2, { error: 'name the body that issued the permit' }).max(160),
  number: z.string().trim().min(1, { error: 'give the permit number' }).max(80),
  validFrom: day,
  validTo: day,
}).refine(x => x.validTo >= x.validFrom, { error: 'must not be before the first day', path: ['validTo'] })
export type PermitInput = z.infer<typeof permitSchema>

/** A person appointed to an official function. */
export const appointmentSchema = z.object({
  function: z.enum(OFFICIAL_FUNCTIONS, { error: 'must be one of the official functions' }),
  userId: recordId,
})
export const endAppointmentSchema = z.object({
  reason: z.string().trim().min(3, { error: 'say why the appointment ends' }).max(300),
})
