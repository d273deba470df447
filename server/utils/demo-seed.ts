import { seedDemo } from '../database/demo'

let seeding: Promise<unknown> = Promise.resolve()

/** Resolves once the demo scenario is in the database (at once when the demo is off). */
export const demoSeeded = () => seeding

export function startDemoSeed() {
  seeding = seedDemo(useDb(), hashPassword).then(
    created => console.info(created ? '[trapline] demo scenario seeded' : '[trapline] demo scenario already present'),
    (error) => { console.error('[trapline] demo seed failed', error); throw error },
  )
}
