import type { EventRole } from '../constants'

/** Something one role has to do next at an event, with where to do it. */
export interface Task {
  title: string
  detail: string
  href: string
  done: boolean
}

/** One role of a person at one event, and its tasks, open ones first. */
export interface RoleHome {
  eventId: number
  eventName: string
  role: EventRole
  teamName: string | null
  tasks: Task[]
}
