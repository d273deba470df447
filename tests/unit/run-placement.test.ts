import { describe, expect, it } from 'vitest'
import { profiles } from '#shared/rules/profiles'
import { placeRun, type OpenAttempt } from '#shared/rules/run-placement'

const at = (iso: string) => Date.parse(iso)
const openWith = (direction: 'out' | 'back', startedAt: string, deadline: string | null = null): OpenAttempt => ({
  id: 7,
  runs: [{ id: 70, direction, startedAtMs: at(startedAt) }],
  windowDeadlineMs: deadline ? at(deadline) : null,
  windowOpensMs: null,
})

describe('where a new run goes', () => {
  // International motorcycle rules: two runs in opposite directions, the whole attempt within 2 h of the start
  // of the first run (FIM world records page, seen).
  const moto = profiles['intl-motorcycle']

  it('pairs a back run inside the window with the open attempt\'s out run', () => {
    const p = placeRun(moto, openWith('out', '2026-08-20T10:00:00Z'), { direction: 'back', startedAtMs: at('2026-08-20T10:40:00Z') }, 'UTC')
    expect(p.joins).toBe(7)
    expect(p.message).toBe('This run is the back run of attempt #7, pairing with run #70.')
  })

  it('starts a new attempt for a second run in the same direction, and says so', () => {
    const p = placeRun(moto, openWith('out', '2026-08-20T10:00:00Z'), { direction: 'out', startedAtMs: at('2026-08-20T10:20:00Z') }, 'UTC')
    expect(p.joins).toBeNull()
    expect(p.message).toContain('This run starts a new attempt.')
    expect(p.message).toContain('its second run must go back')
    expect(p.message).toContain('Attempt #7 keeps its one run (#70, out)')
  })

  it('never pairs a run that starts after the window closed (2 h from the first start)', () => {
    // 10:00 + 120 min = 12:00: a start at 12:00:00 still may; one at 12:00:01 may not.
    const open = openWith('out', '2026-08-20T10:00:00Z')
    expect(placeRun(moto, open, { direction: 'back', startedAtMs: at('2026-08-20T12:00:00Z') }, 'UTC').joins).toBe(7)
    const late = placeRun(moto, open, { direction: 'back', startedAtMs: at('2026-08-20T12:00:01Z') }, 'UTC')
    expect(late.joins).toBeNull()
    expect(late.message).toContain('window of 120 min closed')
  })

  it('never pairs runs on different days where the window is not known yet', () => {
    // A window from the finish of the first run: unknown until that run has a time. Same day in the event's zone
    // pairs; the next day does not. 23:30 and 00:30 in Denver (UTC−6 in summer) are on different days there.
    const fromFinish = { ...moto, window: { ...moto.window, value: { kind: 'elapsed' as const, minutes: 60, from: 'finish-first' as const, to: 'start-second' as const } } }
    const open = openWith('out', '2026-08-21T05:30:00Z')
    expect(placeRun(fromFinish, open, { direction: 'back', startedAtMs: at('2026-08-21T05:50:00Z') }, 'America/Denver').joins).toBe(7)
    const nextDay = placeRun(fromFinish, open, { direction: 'back', startedAtMs: at('2026-08-21T06:30:00Z') }, 'America/Denver')
    expect(nextDay.joins).toBeNull()
    expect(nextDay.message).toContain('on another day')
  })

  // Club procedure: qualifying run, then the record run the next morning in the same direction (club pages, seen).
  const club = profiles['club-same-direction']

  it('pairs a club record run in the same direction the next morning; the other direction starts afresh', () => {
    const open = openWith('out', '2026-08-20T16:00:00Z', '2026-08-21T17:59:59.999Z')
    expect(placeRun(club, open, { direction: 'out', startedAtMs: at('2026-08-21T14:00:00Z') }, 'America/Denver').joins).toBe(7)
    const other = placeRun(club, open, { direction: 'back', startedAtMs: at('2026-08-21T14:00:00Z') }, 'America/Denver')
    expect(other.joins).toBeNull()
    expect(other.message).toContain('Both runs of a pair go the same way under this profile')
    const late = placeRun(club, open, { direction: 'out', startedAtMs: at('2026-08-21T18:30:00Z') }, 'America/Denver')
    expect(late.joins).toBeNull()
  })

  it('starts a first attempt where there is none open', () => {
    expect(placeRun(moto, null, { direction: 'out', startedAtMs: 0 }, 'UTC')).toEqual({ joins: null, closes: null, message: 'This run starts a new attempt.' })
  })
})
