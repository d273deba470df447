import { localDateTime } from '#shared/rules/zoned'

/** An instant as the event's clock shows it, with the zone named: "2026-08-20 10:01:09 (America/Denver)". */
export const eventTime = (iso: string | Date, zone: string) =>
  `${localDateTime(new Date(iso).getTime(), zone)} (${zone})`
