import { deviceLayoutSaveSchema } from '#shared/schemas/device-import'

// How a timing system's own file reads (columns, separator, channel → trap), kept for its next file.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['organiser', 'timekeeper'])
  const { systemId, layout } = await validBody(event, deviceLayoutSaveSchema)
  await saveDeviceLayout(eventId, systemId, layout, user.id)
  return { systemId, layout }
})
