// npm run admin -- --email someone@example.org --name "Full Name"
// Makes the person a site administrator (creating the account if needed) and prints a one-time link,
// valid for 24 hours, through which they set their password. For a production start without the demo.
import { createHash, randomBytes } from 'node:crypto'
import { parseArgs } from 'node:util'
import pg from 'pg'

const { values } = parseArgs({ options: { email: { type: 'string' }, name: { type: 'string' } } })
const email = values.email?.trim().toLowerCase()
if (!email || !/^[^@\s]+@[^@\s]+$/.test(email)) {
  console.error('usage: npm run admin -- --email someone@example.org [--name "Full Name"]')
  process.exit(2)
}
const url = process.env.NUXT_DATABASE_URL ?? process.env.DATABASE_URL
if (!url) {
  console.error('Set NUXT_DATABASE_URL to the database of the installation.')
  process.exit(2)
}
const site = (process.env.NUXT_SITE_URL ?? 'http://localhost:3000').replace(/\/$/, '')
const client = new pg.Client({ connectionString: url })
await client.connect()
try {
  await client.query('begin')
  const { rows: [user] } = await client.query(
    `insert into users (email, name, is_admin) values ($1, $2, true)
     on conflict (email) do update set is_admin = true returning id`,
    [email, values.name?.trim() || email],
  )
  const token = randomBytes(32).toString('base64url')
  await client.query(
    `insert into auth_tokens (user_id, purpose, token_hash, expires_at) values ($1, 'invite', $2, now() + interval '24 hours')`,
    [user.id, createHash('sha256').update(token).digest('hex')],
  )
  await client.query('commit')
  console.log(`${email} is a site administrator. Set the password, once, within 24 hours:\n${site}/set-password?token=${token}`)
}
catch (e) {
  await client.query('rollback')
  console.error(e.message)
  process.exitCode = 1
}
finally {
  await client.end()
}
