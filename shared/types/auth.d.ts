declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    role: import('../roles').Role
  }
  interface UserSession {
    loggedInAt: number
  }
  // kept in the sealed cookie only, never sent to the page (nuxt-auth-utils strips `secure`)
  interface SecureSessionData {
    sid: string
  }
}

export {}
