import { eq, sql } from 'drizzle-orm'
import { forgotSchema } from '#shared/schemas/auth'

// public route: always the same answer, so it does not tell which addresses have accounts.
export default defineEventHandler(async (event) => {
  const { email } = await validBody(event, forgotSchema)
  await spend(['resetByClient', clientAddress(event)], ['resetByAddress', email])
  const [user] = await useDb().select().from(tables.users).where(eq(tables.users.email, email))
  if (user) {
    const token = await issueToken(user.id, 'reset')
    await queueMail([{
      to: user.email,
      subject: 'Trapline: set a new password',
      text:
        `Hello ${user.name},\n\nSomeone asked to reset the Trapline password of this address. If it was you, `
        + `set a new password with this link (valid for 1 hour, usable once):\n\n${linkFor(token)}\n\nIf not, ignore `
        + `this message.\n`,
    }], { wait: false })
  }
  else {
    // Two round trips, as the token and the outbox take, so that the answer takes about the same time.
    await useDb().execute(sql`select 1`)
    await useDb().execute(sql`select 1`)
  }
  setResponseStatus(event, 202)
  return { message: 'If this address has an account, a link to set a new password is on its way.' }
})
