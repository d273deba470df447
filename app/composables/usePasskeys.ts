import { startAuthentication, startRegistration } from '@simplewebauthn/browser'

/** A browser refusal (cancelled, no passkey on this device) as the error the forms show. */
const refused = (e: unknown) => {
  if ((e as { statusCode?: number }).statusCode) return e
  const why = (e as Error).name ?? 'cancelled'
  return { statusMessage: `The passkey did not answer (${why}): nothing was signed or saved` }
}

/**
 * Passkeys in the browser: registering one on this device, and answering a signing challenge, which
 * the server sets to the SHA-256 of exactly the content to sign (or of what a new record will say).
 */
export function usePasskeys() {
  async function register(name: string, password: string) {
    const optionsJSON = await $fetch('/api/me/passkeys/options', { method: 'POST' })
    let response
    try {
      response = await startRegistration({ optionsJSON: optionsJSON as never })
    }
    catch (e) {
      throw refused(e)
    }
    return $fetch('/api/me/passkeys', { method: 'POST', body: { name, password, response } })
  }
  /** The passkey's answer for the record whose signing options are at `optionsUrl`. */
  async function answer(optionsUrl: string, draft?: Record<string, unknown>) {
    const optionsJSON = await $fetch<Record<string, unknown>>(optionsUrl, { method: 'POST', body: draft ?? {} })
    try {
      return await startAuthentication({ optionsJSON: optionsJSON as never })
    }
    catch (e) {
      throw refused(e)
    }
  }
  return { register, answer }
}
