import { eq } from 'drizzle-orm'
import { allItems } from '#shared/inspection/evaluate'
import { seedDemo } from '../database/demo'
import demo from '../database/demo-people.json'

let seeding: Promise<unknown> = Promise.resolve()

/** Resolves once the demo scenario is in the database (at once when the demo is off). */
export const demoSeeded = () => seeding

export function startDemoSeed() {
  seeding = seedDemo(useDb(), hashPassword)
    .then(async (created) => {
      if (created) await seedDemoInspections()
      console.info(created ? '[trapline] demo scenario seeded' : '[trapline] demo scenario already present')
    })
    .catch((error) => { console.error('[trapline] demo seed failed', error); throw error })
}

/** Both demo machines inspected and signed off by the demo scrutineer, through the same code as the app. */
async function seedDemoInspections() {
  const [scrutineer] = await useDb().select().from(tables.users).where(eq(tables.users.email, 'scrutineer@trapline.test'))
  const entries = await useDb().select({ entry: tables.entries, machine: tables.machines }).from(tables.entries).innerJoin(tables.machines, eq(tables.machines.id, tables.entries.machineId))
  const measured: Record<string, [number, string]> = { isolation: [2.4, 'MΩ'], bonding: [0.03, 'Ω'], 'canopy-exit': [21, 's'] }
  for (const { entry, machine } of entries) {
    const inspection = await startInspection(entry.eventId, { entryId: entry.id, baseId: 'electric-motorcycle' }, scrutineer!.id)
    await setBus(inspection.id, { busVoltageV: 400, busKind: 'dc' })
    for (const item of allItems(inspection.checklist)) {
      const streamlined = machine.division === 'full'
      if (item.key === 'canopy-exit' && !streamlined) { await answerItem(inspection.id, { itemKey: item.key, result: 'na', note: 'no canopy' }, scrutineer!.id); continue }
      const [value, unit] = item.key === 'mass' ? [Number(machine.declaredMassKg) + 1.5, 'kg'] : measured[item.key] ?? []
      await answerItem(inspection.id, { itemKey: item.key, result: 'pass', value, unit }, scrutineer!.id)
    }
    await signInspection(inspection.id, { password: demo.password, typedName: scrutineer!.name }, scrutineer!)
  }
}
