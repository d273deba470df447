import { beforeAll, describe, expect, it } from 'vitest'
import { call, DEMO_PASSWORD, demoEmail, demoEventId, demoMileRecord, invitedPerson, linkToken, login, mailTo, unique, url, useTestServer } from '../support/api'
import { form, pdf } from '../support/files'
import { routeFiles } from '../support/routes'
import { clearedEntry } from '../support/entries'
import { kilometreRun, minutesAgo } from '../support/runs'

await useTestServer()

// Every API route file × every role and anonymous → the expected status. A route file with no entry
// here fails the first test, so no route is ever forgotten. "outsider" holds a role at another
// event only: the demo event's routes must answer 404 to them.
const WHO = ['anonymous', 'admin', 'organiser', 'timekeeper', 'scrutineer', 'team', 'official', 'outsider'] as const
type Who = (typeof WHO)[number]

const all = (status: number) => Object.fromEntries(WHO.map(w => [w, status])) as Record<Who, number>
const signedIn = (status: number) => ({ ...all(status), anonymous: 401 })
const eventMembers = (status: number) => ({ ...signedIn(status), outsider: 404 })
const organiserOnly = (status: number) => ({ ...eventMembers(403), admin: status, organiser: status })
const adminOnly = (status: number) => ({ ...signedIn(403), admin: status })
/** Only these roles at the event; the site administrator holds no role there, so 404. */
const rolesOnly = (status: number, ...roles: Who[]) => ({ ...eventMembers(403), admin: 404, ...Object.fromEntries(roles.map(r => [r, status])) })

// Bodies are empty on purpose: past the role check a write answers 422, which shows the gate let it through.
const TABLE: Record<string, { expect: Record<Who, number>, body?: unknown }> = {
  'GET /api/health': { expect: all(200) },
  'GET /api/alive': { expect: all(200) },
  'GET /api/ready': { expect: all(200) },
  'GET /api/clock': { expect: all(200) },
  'GET /api/profiles': { expect: all(200) },
  'POST /api/calculator': { expect: all(422), body: {} },
  'POST /api/auth/login': { expect: all(422), body: {} },
  'POST /api/auth/logout': { expect: all(204) },
  'POST /api/auth/forgot': { expect: all(422), body: {} },
  'GET /api/auth/token': { expect: all(422) },
  'POST /api/auth/token': { expect: all(422), body: {} },
  'POST /api/auth/password': { expect: signedIn(422), body: {} },
  'GET /api/me': { expect: signedIn(200) },
  'GET /api/me/passkeys': { expect: signedIn(200) },
  'POST /api/me/passkeys/options': { expect: signedIn(200) },
  'POST /api/me/passkeys': { expect: signedIn(422), body: {} },
  'POST /api/me/passkeys/[id]/revocation': { expect: signedIn(422), body: {} },
  // Signing options name the content's digest; the demo's people have no passkey (409 for the right role).
  'POST /api/inspections/[id]/signing-options': { expect: rolesOnly(409, 'scrutineer') },
  'POST /api/attempts/[id]/signing-options': { expect: rolesOnly(409, 'timekeeper') },
  'POST /api/events/[id]/statements/signing-options': { expect: rolesOnly(422, 'official'), body: {} },
  'GET /api/dossiers/[id]/certificate': { expect: all(200) }, // public: the record book links it
  'GET /api/record-book.csv': { expect: all(200) },
  'GET /api/record-book.xlsx': { expect: all(200) },
  // The team's own ratified demo dossier: past the role check, the empty body answers 422.
  'POST /api/dossiers/[id]/withdrawal': { expect: { ...eventMembers(403), admin: 404, team: 422 }, body: {} },
  'POST /api/dossiers/[id]/homologation': { expect: rolesOnly(422, 'official'), body: {} },
  'POST /api/dossiers/[id]/revocation': { expect: rolesOnly(422, 'official'), body: {} },
  'POST /api/dossiers/[id]/signing-options': { expect: rolesOnly(422, 'official'), body: {} },
  'GET /api/home': { expect: signedIn(200) },
  'GET /api/events': { expect: signedIn(200) },
  'POST /api/events': { expect: adminOnly(422), body: {} },
  'GET /api/admin/outbox': { expect: adminOnly(200) },
  'GET /api/events/[id]': { expect: { ...eventMembers(200), admin: 200 } },
  'PATCH /api/events/[id]': { expect: organiserOnly(200), body: {} },
  'GET /api/events/[id]/people': { expect: organiserOnly(200) },
  'DELETE /api/events/[id]/people/[membershipId]': { expect: organiserOnly(422) },
  'POST /api/events/[id]/people': { expect: organiserOnly(422), body: {} },
  'POST /api/events/[id]/courses': { expect: rolesOnly(422, 'organiser'), body: {} },
  'POST /api/events/[id]/traps': { expect: rolesOnly(422, 'organiser'), body: {} },
  'PATCH /api/events/[id]/setup/[kind]/[itemId]': { expect: rolesOnly(422, 'organiser'), body: {} },
  'POST /api/events/[id]/setup/[kind]/[itemId]/retire': { expect: rolesOnly(422, 'organiser'), body: {} },
  'POST /api/events/[id]/distances': { expect: rolesOnly(422, 'organiser'), body: {} },
  'POST /api/events/[id]/timing-systems': { expect: rolesOnly(422, 'organiser'), body: {} },
  'POST /api/events/[id]/records': { expect: rolesOnly(422, 'organiser'), body: {} },
  'POST /api/events/[id]/device-imports': { expect: rolesOnly(422, 'timekeeper'), body: {} },
  'PUT /api/events/[id]/device-layouts': { expect: rolesOnly(422, 'organiser', 'timekeeper'), body: {} },
  'PUT /api/events/[id]/profile': { expect: rolesOnly(422, 'organiser'), body: {} },
  'PUT /api/events/[id]/classes': { expect: rolesOnly(422, 'organiser'), body: {} },
  'POST /api/events/[id]/entries': { expect: rolesOnly(422, 'team'), body: {} },
  'GET /api/events/[id]/setup': { expect: { ...eventMembers(200), admin: 200 } },
  'GET /api/events/[id]/live': { expect: { ...eventMembers(200), admin: 200 } },
  'GET /api/events/[id]/live-stream': { expect: { ...eventMembers(200), admin: 200 } },
  'GET /api/events/[id]/paper': { expect: { ...eventMembers(200), admin: 200 } },
  'GET /api/events/[id]/paper.pdf': { expect: { ...eventMembers(200), admin: 200 } },
  'GET /api/events/[id]/day.csv': { expect: { ...eventMembers(200), admin: 200 } },
  'GET /api/events/[id]/day.xlsx': { expect: { ...eventMembers(200), admin: 200 } },
  // The streamliner's run: its team and every other role at the event; the site administrator holds none.
  'GET /api/runs/[id]/time-slip': { expect: { ...eventMembers(200), admin: 404 } },
  'GET /api/runs/[id]/time-slip.pdf': { expect: { ...eventMembers(200), admin: 404 } },
  'GET /api/events/[id]/run-sheet': { expect: rolesOnly(200, 'timekeeper', 'organiser', 'official') },
  'POST /api/events/[id]/runs': { expect: rolesOnly(422, 'timekeeper'), body: {} },
  'POST /api/events/[id]/imports': { expect: rolesOnly(422, 'timekeeper'), body: {} },
  'POST /api/runs/[id]/readings': { expect: rolesOnly(422, 'timekeeper'), body: {} },
  'POST /api/runs/[id]/abort': { expect: rolesOnly(422, 'timekeeper'), body: {} },
  'POST /api/runs/[id]/weather': { expect: rolesOnly(422, 'timekeeper'), body: {} },
  'POST /api/readings/[id]/corrections': { expect: rolesOnly(422, 'timekeeper'), body: {} },
  'POST /api/attempts/[id]/signatures': { expect: rolesOnly(422, 'timekeeper'), body: {} },
  'POST /api/attempts/[id]/reopen': { expect: rolesOnly(422, 'timekeeper'), body: {} },
  // The chief timekeeper accounts for a time one system lacks (the function is checked past the role).
  'POST /api/attempts/[id]/set-asides': { expect: rolesOnly(422, 'official', 'timekeeper'), body: {} },
  'POST /api/set-asides/[id]/signatures': { expect: rolesOnly(422, 'official', 'timekeeper'), body: {} },
  'POST /api/attempts/[id]/confirmations': { expect: rolesOnly(422, 'official'), body: {} },
  'POST /api/attempts/[id]/impound': { expect: rolesOnly(409, 'scrutineer'), body: {} },
  'POST /api/attempts/[id]/post-run-check': { expect: rolesOnly(422, 'scrutineer'), body: {} },
  'POST /api/machines/[id]/suspensions': { expect: rolesOnly(422, 'scrutineer'), body: {} },
  'POST /api/checklists/[id]/signatures': { expect: rolesOnly(422, 'scrutineer'), body: {} },
  'GET /api/attempts/[id]/timing-sheet': { expect: { ...eventMembers(200), admin: 404 } },
  'GET /api/events/[id]/checklists': { expect: { ...eventMembers(200), admin: 200 } },
  'POST /api/events/[id]/checklists': { expect: rolesOnly(422, 'organiser'), body: {} },
  'GET /api/events/[id]/inspections': { expect: { ...eventMembers(200), admin: 200 } },
  'POST /api/events/[id]/inspections': { expect: rolesOnly(422, 'scrutineer'), body: {} },
  'GET /api/events/[id]/statements': { expect: { ...eventMembers(200), admin: 200 } },
  'POST /api/events/[id]/statements': { expect: rolesOnly(422, 'official'), body: {} },
  'POST /api/statements/[id]/withdrawals': { expect: rolesOnly(422, 'official'), body: {} },
  'GET /api/inspections/[id]': { expect: { ...eventMembers(200), admin: 404 } },
  'PATCH /api/inspections/[id]': { expect: rolesOnly(422, 'scrutineer'), body: {} },
  'POST /api/inspections/[id]/answers': { expect: rolesOnly(422, 'scrutineer'), body: {} },
  'POST /api/inspections/[id]/signatures': { expect: rolesOnly(422, 'scrutineer'), body: {} },
  'GET /api/signatures/[id]': { expect: { ...eventMembers(200), admin: 404 } },
  'POST /api/events/[id]/evidence': { expect: { ...eventMembers(422), admin: 404 }, body: {} },
  'GET /api/events/[id]/evidence': { expect: { ...eventMembers(200), admin: 200 } },
  'GET /api/events/[id]/evidence/[sha]': { expect: { ...eventMembers(200), admin: 200 } },
  'GET /api/evidence/[id]': { expect: { ...eventMembers(200), admin: 404 } },
  'GET /api/evidence/[id]/content': { expect: { ...eventMembers(200), admin: 404 } },
  'GET /api/attempts/[id]/readiness': { expect: { ...eventMembers(200), admin: 404 } },
  'GET /api/attempts/[id]/dossiers': { expect: { ...eventMembers(200), admin: 404 } },
  // On the second team's attempt, which is not ready: the organiser is refused naming what is missing.
  'POST /api/attempts/[id]/dossiers': { expect: { ...eventMembers(403), admin: 404, organiser: 422, team: 404 } },
  // The demo's ratified dossier: public.
  'GET /api/dossiers/[id]/pdf': { expect: all(200) },
  'POST /api/dossiers/[id]/submission': { expect: { ...eventMembers(403), admin: 404, team: 409 } },
  'POST /api/dossiers/[id]/decision': { expect: rolesOnly(422, 'official'), body: {} },
  'POST /api/dossiers/verify': { expect: all(422), body: {} },
  'GET /api/record-book': { expect: all(200) },
  'GET /api/seal': { expect: all(200) },
  'PATCH /api/entries/[id]': { expect: rolesOnly(422, 'team'), body: {} },
  // The demo's organiser opened the public board: anyone reads it.
  'GET /api/board/[id]': { expect: all(200) },
  'GET /api/events/[id]/entry-changes': { expect: rolesOnly(200, 'team', 'organiser') },
  'POST /api/change-requests/[id]/decision': { expect: rolesOnly(422, 'organiser'), body: {} },
  'PUT /api/events/[id]/fees': { expect: rolesOnly(422, 'organiser'), body: {} },
  'POST /api/events/[id]/notices': { expect: rolesOnly(422, 'organiser', 'official'), body: {} },
  'PUT /api/events/[id]/permit': { expect: rolesOnly(422, 'organiser'), body: {} },
  'POST /api/events/[id]/appointments': { expect: rolesOnly(422, 'organiser'), body: {} },
  'GET /api/events/[id]/officials': { expect: { ...eventMembers(200), admin: 200 } },
  'POST /api/appointments/[id]/end': { expect: rolesOnly(422, 'organiser'), body: {} },
  'GET /api/events/[id]/notices': { expect: { ...eventMembers(200), admin: 404 } },
  'GET /api/events/[id]/briefings': { expect: { ...eventMembers(200), admin: 404 } },
  'POST /api/events/[id]/briefings': { expect: rolesOnly(422, 'organiser', 'official'), body: {} },
  'POST /api/briefings/[id]/sign-ons': { expect: { ...eventMembers(422), admin: 404 }, body: {} },
  'POST /api/entries/[id]/start-overrides': { expect: rolesOnly(422, 'official', 'organiser'), body: {} },
  'GET /api/events/[id]/protests': { expect: { ...eventMembers(200), admin: 404 } },
  'POST /api/events/[id]/protests': { expect: rolesOnly(422, 'team'), body: {} },
  'POST /api/protests/[id]/decision': { expect: rolesOnly(422, 'official', 'organiser'), body: {} },
  'POST /api/protests/[id]/appeals': { expect: rolesOnly(422, 'team'), body: {} },
  // The planner computes for anyone; saved plans are their team's alone (the demo's plan is Larkspur Works').
  'POST /api/planner': { expect: all(422), body: {} },
  'GET /api/plans': { expect: signedIn(200) },
  'POST /api/plans': { expect: signedIn(422), body: {} },
  'GET /api/plans/[id]': { expect: { ...signedIn(404), team: 200 } },
  'PUT /api/plans/[id]': { expect: { ...signedIn(404), team: 422 }, body: {} },
  'GET /api/plans/[id]/comparison': { expect: { ...signedIn(404), team: 422 } },
  'GET /api/events/[id]/fees': { expect: { ...eventMembers(200), admin: 200 } },
  'POST /api/entries/[id]/checkout': { expect: rolesOnly(422, 'team'), body: {} },
  // public route: without the provider's signature a webhook is refused.
  'POST /api/payments/webhook': { expect: all(400), body: {} },
  'GET /api/events/[id]/payments': { expect: rolesOnly(200, 'organiser') },
  'GET /api/events/[id]/payments.csv': { expect: rolesOnly(200, 'organiser') },
  'GET /api/events/[id]/payments.xlsx': { expect: rolesOnly(200, 'organiser') },
  'POST /api/payments/[id]/refunds': { expect: rolesOnly(422, 'organiser'), body: {} },
  // The demo's paid entry fee is the demo team's.
  'GET /api/payments/[id]/receipt.pdf': { expect: rolesOnly(200, 'team', 'organiser') },
}

describe('authorization table', () => {
  const cookies = {} as Record<Who, string>
  let eventId = 0
  const ids = { 'runs': 0, 'readings': 0, 'attempts': 0, 'inspections': 0, 'statements': 0, 'signatures': 0, 'evidence': 0, 'dossiers': 0, 'machines': 0, 'checklists': 0, 'unreadyAttempt': 0, 'entries': 0, 'change-requests': 0, 'payments': 0, 'appointments': 0, 'briefings': 0, 'protests': 0, 'plans': 0, 'set-asides': 0 }
  let sha = ''
  let outsiderEmail = ''
  // Signing out ends the session it was sent with: it is sent a session of its own, so the others go on.
  const ownSession = (who: Who) => (who === 'outsider' ? login(outsiderEmail, 'outsider-password-1') : login(demoEmail(who)))

  beforeAll(async () => {
    for (const who of ['admin', 'organiser', 'timekeeper', 'scrutineer', 'team', 'official'] as const) cookies[who] = await login(demoEmail(who))
    cookies.anonymous = ''
    eventId = await demoEventId(cookies.organiser)
    const sheet = await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: cookies.timekeeper })
    const streamliner = sheet.body.attempts.find((a: { entry: { teamName: string } }) => a.entry.teamName === 'Larkspur Works')
    ids.attempts = streamliner.id
    ids.unreadyAttempt = sheet.body.attempts.find((a: { entry: { teamName: string } }) => a.entry.teamName !== 'Larkspur Works').id
    // A ratified dossier, from the public record book (other test files may add newer versions).
    ids.dossiers = Number(/dossiers\/(\d+)\/pdf/.exec((await demoMileRecord()).dossierUrl)![1])
    // Its run out (the demo's first run of the day).
    ids.runs = streamliner.runs.find((r: { direction: string }) => r.direction === 'out').id
    // The streamliner has run: a correction of its entry is a request for the organiser.
    ids.entries = streamliner.entry.id
    const asked = await call('PATCH', `/api/entries/${ids.entries}`, {
      cookie: cookies.team,
      body: {
        rider: { name: 'Mara Quillfeather', licenceNo: 'DEMO-L-2', licenceExpires: '2099-01-01' },
        machine: { name: 'Larkspur Fennwick streamliner', power: 'electric', declaredMassKg: '290.0', division: 'full' },
        reason: 'licence renewed',
      },
    })
    expect(asked.body.status, JSON.stringify(asked.body)).toBe('requested')
    ids['change-requests'] = asked.body.requestId
    const paid = await call('GET', `/api/events/${eventId}/payments`, { cookie: cookies.organiser })
    ids.appointments = (await call('GET', `/api/events/${eventId}/officials`, { cookie: cookies.organiser })).body.appointments
      .find((a: { function: string }) => a.function === 'clerk-of-course').id
    // The demo's riders' briefing, and the protest the second team lodged (decided: the stewards dismissed it).
    ids.briefings = (await call('GET', `/api/events/${eventId}/briefings`, { cookie: cookies.organiser })).body.briefings
      .find((b: { title: string }) => b.title === 'Riders\' briefing, run day').id
    ids.protests = (await call('GET', `/api/events/${eventId}/protests`, { cookie: cookies.organiser })).body
      .find((p: { grounds: string }) => p.grounds.startsWith('The back run\'s backup reading')).id
    // A stewards' set-aside awaiting its second signature: a cross-check of the test's own, proposed by a steward.
    const daySetup = await call('GET', `/api/events/${eventId}/setup`, { cookie: cookies.organiser })
    const north = daySetup.body.courses.find((c: { name: string }) => c.name === 'North course')
    const place = {
      eventId, timeZone: daySetup.body.event.timeZone, timekeeper: cookies.timekeeper,
      traps: { 'K-in': north.traps.find((t: { label: string }) => t.label === 'K-in').id, 'K-out': north.traps.find((t: { label: string }) => t.label === 'K-out').id },
      systems: Object.fromEntries(daySetup.body.systems.map((x: { role: string, id: number }) => [x.role, x.id])) as Record<'primary' | 'backup', number>,
    }
    const crossed = await kilometreRun(place, await clearedEntry(eventId, 'Gate Crossed'), 'out', minutesAgo(30), { primary: [0, 9], backup: [0, 9.05] })
    const proposed = await call('POST', `/api/attempts/${crossed.attemptId}/set-asides`, {
      cookie: await login('official2@trapline.test'),
      body: { code: 'timing.cross-check', runId: crossed.id, reason: 'The backup beam was knocked by a gust.', typedName: 'Orla Ormsby', password: DEMO_PASSWORD },
    })
    expect(proposed.status, JSON.stringify(proposed.body)).toBe(201)
    ids['set-asides'] = proposed.body.id
    ids.plans = (await call('GET', '/api/plans', { cookie: cookies.team })).body
      .find((p: { name: string }) => p.name === 'North course, flying mile, run-day air').id
    ids.payments = paid.body.payments.find((p: { receiptNo: string }) => p.receiptNo === 'R-DEMO-1').id
    const overview = await call('GET', `/api/events/${eventId}`, { cookie: cookies.organiser })
    ids.machines = overview.body.teams.find((t: { name: string }) => t.name === 'Larkspur Works').machines[0].id
    ids.readings = sheet.body.history.find((h: { runId: number }) => h.runId === ids.runs).id
    // An adapted checklist that leaves out a safety item, waiting for a scrutineer's signature.
    const copy = await call('POST', `/api/events/${eventId}/checklists`, {
      cookie: cookies.organiser,
      body: { baseId: 'electric-motorcycle', removeItems: ['parachute'], safetyRemovals: [{ itemKey: 'parachute', reference: 'test rulebook, art. 1' }], note: 'test rulebook' },
    })
    expect(copy.status, JSON.stringify(copy.body)).toBe(201)
    ids.checklists = copy.body.id
    // The demo's first entry is the demo team's; its inspection is signed.
    const inspections = await call('GET', `/api/events/${eventId}/inspections`, { cookie: cookies.organiser })
    ids.inspections = inspections.body.find((e: { team: string }) => e.team === 'Larkspur Works').inspectionId
    ids.signatures = (await call('GET', `/api/inspections/${ids.inspections}`, { cookie: cookies.organiser })).body.signature.id
    // A statement of an official of this test's own: a demo official already has one on this attempt.
    const witness = await invitedPerson('official')
    const statement = await call('POST', `/api/events/${eventId}/statements`, {
      cookie: witness.cookie,
      body: { attemptId: ids.attempts, runsSeen: 'both', position: 'timing hut', conditions: 'calm', password: witness.password, typedName: witness.name },
    })
    expect(statement.status).toBe(201)
    ids.statements = statement.body.id
    // An event-level file (the course survey), which every role at the event may see.
    const setup = await call('GET', `/api/events/${eventId}/setup`, { cookie: cookies.organiser })
    const survey = await fetch(url(`/api/events/${eventId}/evidence`), { method: 'POST', headers: { cookie: cookies.organiser }, body: form({ kind: 'survey-certificate', courseId: setup.body.courses.find((c: { name: string }) => c.name === 'North course').id }, { name: 'survey.pdf', bytes: pdf('table') }) })
    const surveyRow = await survey.json()
    expect(survey.status).toBe(201)
    ids.evidence = surveyRow.id
    sha = surveyRow.sha256
    // The outsider: organiser of a second event created by the site administrator, signed in through the invitation.
    const email = unique('outsider')
    const created = await call('POST', '/api/events', {
      cookie: cookies.admin,
      body: { name: 'Second test event', venue: 'Test course', startsOn: '2026-09-01', endsOn: '2026-09-02', timeZone: 'UTC', profileId: 'intl-automobile', organiserEmail: email, organiserName: 'Outside Organiser' },
    })
    expect(created.status).toBe(201)
    const token = linkToken((await mailTo(email, 'invited')).text)
    const set = await call('POST', '/api/auth/token', { body: { token, password: 'outsider-password-1' } })
    expect(set.status).toBe(200)
    cookies.outsider = await login(email, 'outsider-password-1')
    outsiderEmail = email
  })

  it('has an entry for every route file, and no entry without a file', () => {
    expect(routeFiles().sort()).toEqual(Object.keys(TABLE).sort())
  })

  for (const [route, spec] of Object.entries(TABLE)) {
    for (const who of WHO) {
      it(`${route} as ${who} → ${spec.expect[who]}`, async () => {
        const [method, path] = route.split(' ') as [string, string]
        const owner = /^\/api\/(runs|readings|attempts|inspections|statements|signatures|evidence|dossiers|machines|checklists|entries|change-requests|payments|appointments|briefings|protests|plans|set-asides)\/\[/.exec(path)?.[1] as keyof typeof ids | undefined
        const id = route === 'POST /api/attempts/[id]/dossiers' ? ids.unreadyAttempt : owner ? ids[owner] : eventId
        const filled = path.replace('[id]', String(id)).replace('[sha]', sha).replace('[kind]', 'traps').replace('[itemId]', '1')
        const cookie = route === 'POST /api/auth/logout' && who !== 'anonymous' ? await ownSession(who) : cookies[who]
        const r = await call(method, filled, { cookie, body: spec.body })
        expect(r.status, JSON.stringify(r.body)).toBe(spec.expect[who])
      })
    }
  }
})
