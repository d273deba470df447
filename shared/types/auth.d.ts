declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    isAdmin: boolean
  }
  interface UserSession {
    loggedInAt: string
    /** The person's session version when it began; a session of an older version has ended. */
    version: number
    /** The session's own id on the server: signing out ends it there, so the same cookie is refused after. */
    sid?: string
  }
}

export {}
