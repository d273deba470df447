declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    isAdmin: boolean
  }
  interface UserSession {
    loggedInAt: string
  }
}

export {}
