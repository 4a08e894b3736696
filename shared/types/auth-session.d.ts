// Session shape for nuxt-auth-utils: the sealed cookie carries the user; memberships are read
// fresh from the database on every request so role changes and deactivation apply at once.
declare module '#auth-utils' {
  interface User {
    id: string
    email: string
    name: string
  }
  interface UserSession {
    signedInAt: number
  }
}

export {}
