import { z } from 'zod'
import './messages'
import { PAPER_SHEETS } from '../constants'

/** Which day's paper, in the event's zone (today's when left out), and which sheet of it. */
export const dayPaperQuerySchema = z.object({
  date: z.iso.date({ error: 'must be a date, YYYY-MM-DD' }).optional(),
  sheet: z.enum(PAPER_SHEETS, { error: 'one of results, start-list, blank-run-sheet' }).default('results'),
})
export type DayPaperQuery = z.infer<typeof dayPaperQuerySchema>
