import { inArray } from 'drizzle-orm'
import demo from '../database/demo-people.json'

// With NUXT_SEED_DEMO the invented scenario is seeded once. Without it (a production start), the server
// refuses to run while any demo account still opens with the published demo password.
export default defineNitroPlugin(async () => {
  const { seedDemo } = useRuntimeConfig()
  if (seedDemo === true || String(seedDemo) === 'true') return startDemoSeed()
  const rows = await useDb()
    .select({ email: tables.users.email, hash: tables.users.passwordHash })
    .from(tables.users)
    .where(inArray(tables.users.email, demo.people.map(p => p.email)))
    .catch(() => []) // no database yet: the first request will say so
  for (const r of rows) {
    if (r.hash && (await verifyPassword(r.hash, demo.password))) {
      console.error(`[trapline] refusing to start: the demo account ${r.email} opens with the published demo `
        + 'password. Start with the demo (npm start), or use a database without the demo scenario.')
      process.exit(1)
    }
  }
})
