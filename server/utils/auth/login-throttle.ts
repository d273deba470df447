import type { H3Event } from 'h3'

/**
 * Every sign-in counts before the password is checked, so parallel guesses count as many: ten per
 * address from one client in 15 minutes, fifty per address from anywhere in an hour (then a wait of
 * minutes), two hundred per client in a day. A success gives back what it spent and clears that
 * client's count for the address: only wrong guesses use the limits up.
 */
export async function spendSignIn(event: H3Event, email: string) {
  const client = clientAddress(event)
  await spend(
    ['signInByAddressAndClient', `${email}|${client}`],
    ['signInByAddress', email],
    ['signInByClient', client],
  )
  return {
    cleared: async () => {
      await forgive('signInByAddressAndClient', `${email}|${client}`)
      await refund(['signInByAddress', email], ['signInByClient', client])
    },
  }
}

/** Every sign-in, its address and outcome: an audit trail (the limits themselves are in `rate_limits`). */
export async function recordLoginAttempt(email: string, succeeded: boolean) {
  await useDb().insert(tables.loginAttempts).values({ email, succeeded })
}
