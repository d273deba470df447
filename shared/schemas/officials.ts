import { z } from 'zod'
import './messages'
import { OFFICIAL_FUNCTIONS } from '../constants'
import { isoDateTime, recordId } from './fields'
import { signSheetSchema } from './event-day'
import { drawing } from './inspection'
import { START_LINE_CODES } from '../rules/start-line'

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

/** The clerk of the course lets a run start over named start-line findings, with a signed reason. */
export const overrideSchema = signSheetSchema.extend({
  codes: z.array(z.enum(START_LINE_CODES, { error: 'must be a start-line finding' }))
    .min(1, { error: 'name at least one finding to override' }).max(START_LINE_CODES.length),
  reason: z.string().trim().min(3, { error: 'say why the run may start' }).max(500),
})
export type OverrideInput = z.infer<typeof overrideSchema>

/** A riders' briefing: its subject and when it is held. */
export const briefingSchema = z.object({
  title: z.string().trim().min(3, { error: 'give the briefing a title' }).max(160),
  heldAt: isoDateTime,
  notes: z.string().trim().max(4000).default(''),
})
export type BriefingInput = z.infer<typeof briefingSchema>

/**
 * A sign-on to a briefing: on one's own phone (password or passkey), or in person on the organiser's device,
 * where the attendee types their name and draws a signature. A rider signs on as the rider of an entry.
 */
export const signOnSchema = signSheetSchema.extend({
  riderId: recordId.optional(),
  onDevice: z.enum(['own', 'organiser']).default('own'),
  drawingPng: drawing,
})
export type SignOnInput = z.infer<typeof signOnSchema>
