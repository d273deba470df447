import type { EventRole } from '#shared/constants'
import type { Task } from '#shared/types/home'
import type { AttemptProgress, HomeFacts } from './home-facts'

/** One of this person's places at an event: the event, the role and the team. */
export interface HomePlace {
  eventId: number
  role: EventRole
  teamId: number | null
}

const eventPath = (p: HomePlace) => `/events/${p.eventId}`
const attemptsOf = (f: HomeFacts, p: HomePlace) => f.attempts.filter(a => a.event_id === p.eventId)

function organiserTasks(f: HomeFacts, p: HomePlace): Task[] {
  const at = eventPath(p)
  const tc = f.traps.find(t => t.eventId === p.eventId)
  const roles = f.roles.filter(r => r.eventId === p.eventId)
  const held = (role: EventRole) => roles.find(r => r.role === role)?.people ?? 0
  const pending = roles.reduce((s, r) => s + r.pending, 0)
  return [
    {
      title: 'Survey the course',
      detail: tc
        ? `${tc.courses} course(s), ${tc.traps} trap(s) at surveyed positions`
        : 'No course yet: set the course and its traps',
      href: at,
      done: !!tc && tc.traps >= 2,
    },
    ...(['timekeeper', 'scrutineer', 'official'] as const).map(role => ({
      title: `Name ${role === 'official' ? 'an' : 'a'} ${role}`,
      detail: held(role) ? `${held(role)} named` : `No ${role} yet`,
      href: `${at}/people`,
      done: held(role) > 0,
    })),
    {
      title: 'Invitations accepted',
      detail: pending ? `${pending} invitation(s) not yet accepted` : 'Everyone invited has signed in',
      href: `${at}/people`,
      done: pending === 0,
    },
  ]
}

function timekeeperTasks(f: HomeFacts, p: HomePlace): Task[] {
  const at = eventPath(p)
  const tc = f.traps.find(t => t.eventId === p.eventId)
  const sheets = attemptsOf(f, p).filter(a => a.runs >= 2).map(a => ({
    title: `Timing sheet of attempt #${a.id}`,
    detail: `${a.machine}: ${a.locked ? 'signed' : 'two runs in, to be signed'}`,
    href: `${at}/run-sheet`,
    done: a.locked,
  }))
  return [
    {
      title: 'Run sheet',
      detail: tc ? `${tc.traps} trap(s) on the course` : 'The organiser has not set the course yet',
      href: `${at}/run-sheet`,
      done: !!tc,
    },
    ...sheets,
  ]
}

function scrutineerTasks(f: HomeFacts, p: HomePlace): Task[] {
  const at = eventPath(p)
  const entries = f.entries.filter(x => x.eventId === p.eventId)
  if (!entries.length) {
    return [{ title: 'Inspect the machines', detail: 'No machine entered yet', href: `${at}/inspections`, done: false }]
  }
  return entries.map((e) => {
    const c = f.clearance.get(e.id)!
    return {
      title: `Inspect ${e.machine}`,
      detail: c.cleared ? 'cleared to run' : c.why,
      href: c.inspectionId ? `/inspections/${c.inspectionId}` : `${at}/inspections`,
      done: c.cleared,
    }
  })
}

function dossierProgress(a: AttemptProgress) {
  if (a.decided) return 'decided by the officials'
  if (a.submitted) return 'submitted, awaiting the officials'
  if (a.dossiers) return 'sealed, not submitted'
  return `${a.runs} run(s); see what it still needs`
}

function teamTasks(f: HomeFacts, p: HomePlace): Task[] {
  const at = eventPath(p)
  const dossiers = attemptsOf(f, p).filter(a => a.team_id === p.teamId).slice(0, 3).map(a => ({
    title: `Dossier of attempt #${a.id}`,
    detail: `${a.machine}: ${dossierProgress(a)}`,
    href: `/attempts/${a.id}/dossier`,
    done: a.submitted,
  }))
  const machines = f.machines.filter(x => x.teamId === p.teamId)
  const riders = f.riders.filter(r => r.teamId === p.teamId)
  const licences = riders.map((r) => {
    const valid = r.licenceExpires >= r.endsOn
    return {
      title: `Rider licence: ${r.name}`,
      detail: valid ? `valid until ${r.licenceExpires}` : `expires ${r.licenceExpires}, before the event ends`,
      href: at,
      done: valid,
    }
  })
  return [
    ...dossiers,
    {
      title: 'Register the machine',
      detail: machines.length ? machines.map(x => x.machine).join(', ') : 'No machine registered yet',
      href: at,
      done: machines.length > 0,
    },
    ...(riders.length ? licences : [{ title: 'Register the rider', detail: 'No rider yet', href: at, done: false }]),
  ]
}

function officialTasks(f: HomeFacts, p: HomePlace): Task[] {
  const attempts = attemptsOf(f, p)
  const decisions = attempts.filter(a => a.submitted && !a.decided).map(a => ({
    title: `Decide on the dossier of attempt #${a.id}`,
    detail: `${a.machine}: submitted for ratification`,
    href: `/attempts/${a.id}/dossier`,
    done: false,
  }))
  const pairs = attempts.filter(a => a.runs >= 2 && !a.submitted)
  return [
    ...decisions,
    {
      title: 'Witness statements',
      detail: pairs.length ? `${pairs.length} attempt(s) with a pair of runs not yet submitted` : 'No pair waiting',
      href: `${eventPath(p)}/statements`,
      done: !pairs.length,
    },
  ]
}

const tasksByRole: Record<EventRole, (f: HomeFacts, p: HomePlace) => Task[]> = {
  organiser: organiserTasks,
  timekeeper: timekeeperTasks,
  scrutineer: scrutineerTasks,
  team: teamTasks,
  official: officialTasks,
}

/** What one role at one event has to do next, open tasks first. */
export function tasksFor(facts: HomeFacts, place: HomePlace): Task[] {
  const tasks = tasksByRole[place.role](facts, place)
  return tasks.sort((a, b) => Number(a.done) - Number(b.done))
}
