declare module '#auth-utils' {
  interface User {
    id: string
    email: string
    name: string
  }
  interface UserSession {
    /** The user's session version when the session was made; a password reset bumps it. */
    sv?: number
  }
}

export {}
