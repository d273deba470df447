// Prints the demo sign-ins for npm start and the README.
import { readFileSync } from 'node:fs'

const demo = JSON.parse(readFileSync(new URL('../server/database/demo-people.json', import.meta.url), 'utf8'))
for (const p of demo.people) {
  const what = p.admin ? 'site administrator' : p.team ? `team (${p.team})` : p.role
  console.log(`    ${p.email.padEnd(28)} ${what}`)
}
