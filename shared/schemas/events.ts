import { z } from 'zod'
import { PROFILE_IDS } from '../rules/profiles'
import { email, recordId, timeZoneName } from './fields'
import { EVENT_ROLES, type EventRole } from '../constants'

export { EVENT_ROLES }

export const roleLabels: Record<EventRole, string> = {
  organiser: 'Organiser',
  timekeeper: 'Timekeeper',
  scrutineer: 'Scrutineer',
  team: 'Team',
  official: 'Official',
}

const day = z.iso.date({ error: 'must be a date, YYYY-MM-DD' })
const personName = z.string().trim().min(2, { error: 'must be at least 2 characters' }).max(120)

export const createEventSchema = z
  .object({
    name: z.string().trim().min(3, { error: 'must be at least 3 characters' }).max(160),
    venue: z.string().trim().min(2, { error: 'must be at least 2 characters' }).max(160),
    startsOn: day,
    endsOn: day,
    timeZone: timeZoneName,
    profileId: z.enum(PROFILE_IDS, { error: `must be one of ${PROFILE_IDS.join(', ')}` }),
    organiserEmail: email,
    organiserName: personName,
  })
  .refine(x => x.endsOn >= x.startsOn, { error: 'must not be before the first day', path: ['endsOn'] })
export type CreateEventInput = z.infer<typeof createEventSchema>

export const inviteSchema = z
  .object({
    email,
    name: personName,
    role: z.enum(EVENT_ROLES, { error: `must be one of ${EVENT_ROLES.join(', ')}` }),
    teamName: z.string().trim().min(2).max(120).optional(),
  })
  .refine(x => x.role !== 'team' || !!x.teamName, {
    error: 'name the team this person enters for',
    path: ['teamName'],
  })
export type InviteInput = z.infer<typeof inviteSchema>

export const eventIdParams = z.object({ id: recordId })

export const updateEventSchema = z
  .object({
    name: z.string().trim().min(3, { error: 'must be at least 3 characters' }).max(160).optional(),
    venue: z.string().trim().min(2, { error: 'must be at least 2 characters' }).max(160).optional(),
    startsOn: day.optional(),
    endsOn: day.optional(),
    timeZone: timeZoneName.optional(),
    /** A public board of runs and results (no personal data), opted in by the organiser. */
    publicBoard: z.preprocess(v => (v === 'true' ? true : v === 'false' ? false : v), z.boolean().optional()),
  })
  .refine(x => !x.startsOn || !x.endsOn || x.endsOn >= x.startsOn, {
    error: 'must not be before the first day',
    path: ['endsOn'],
  })
export type UpdateEventInput = z.infer<typeof updateEventSchema>
