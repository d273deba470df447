import type { InternalApi } from 'nitropack/types'

/**
 * What the routes answer, typed from the route files themselves: the data types of the pages and
 * components, never redeclared by hand.
 */
export type RunSheet = InternalApi['/api/events/:id/run-sheet']['get']
export type RunSheetRun = RunSheet['attempts'][number]['runs'][number]
export type EventSetup = InternalApi['/api/events/:id/setup']['get']
export type LiveAttempt = NonNullable<InternalApi['/api/events/:id/live']['get']>[number]
export type LiveFinding = LiveAttempt['findings'][number]
export type DayPaperView = InternalApi['/api/events/:id/paper']['get']
export type TimeSlipView = InternalApi['/api/runs/:id/time-slip']['get']
