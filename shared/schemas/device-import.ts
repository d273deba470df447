import { z } from 'zod'
import { recordId } from './fields'

/** A column: its name in the first line, or its number from 1 where the file has no header. */
const column = z.string().trim().min(1, { error: 'name the column' }).max(80, { error: 'at most 80 characters' })
const day = z.iso.date({ error: 'must be a date, YYYY-MM-DD' })

export const DEVICE_DELIMITERS = ['auto', ',', ';', '\t', '|'] as const

export const deviceLayoutSchema = z.object({
  delimiter: z.enum(DEVICE_DELIMITERS, { error: 'choose the separator' }).default('auto'),
  header: z.boolean().default(true),
  columns: z.object({
    channel: column,
    time: column,
    date: column.optional(),
    sequence: column.optional(),
  }),
  channels: z
    .array(z.object({
      channel: z.string().trim().min(1, { error: 'name the channel' }).max(20, { error: 'at most 20 characters' }),
      trapId: recordId,
    }))
    .min(1, { error: 'map at least one channel to a trap' })
    .max(64, { error: 'at most 64 channels' })
    .refine(list => new Set(list.map(c => c.channel)).size === list.length, { error: 'a channel is mapped twice' }),
})
export type DeviceLayoutInput = z.infer<typeof deviceLayoutSchema>

/**
 * A device file already stored as evidence (kind data log), read by a timing system's layout. Without
 * `commit` the assignment is only shown; with it the passings given to runs are written, and the layout kept.
 */
export const deviceImportSchema = z.object({
  systemId: recordId,
  evidenceId: recordId,
  /** The event-zone date of the file's first passing, where its lines carry no date. */
  firstDay: day,
  layout: deviceLayoutSchema.optional(),
  commit: z.boolean().default(false),
})
export type DeviceImportInput = z.infer<typeof deviceImportSchema>

export const deviceLayoutSaveSchema = z.object({ systemId: recordId, layout: deviceLayoutSchema })
export type DeviceLayoutSaveInput = z.infer<typeof deviceLayoutSaveSchema>
