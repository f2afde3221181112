declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    role: 'coordinator' | 'safety' | 'crew'
  }
  interface UserSession {
    loggedInAt: number
  }
}

export {}
