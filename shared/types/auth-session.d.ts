// Session shape for nuxt-auth-utils: the sealed cookie carries the user and its session row; memberships are read
// fresh from the database on every request so role changes and deactivation apply at once.
declare module '#auth-utils' {
  interface User {
    id: string
    email: string
    name: string
  }
  interface UserSession {
    signedInAt: number
    /** the user_sessions row: signing out revokes it, and a copy of the cookie stops working */
    sessionId: string
  }
}

export {}
