import type { Role } from '../utils/roles'

declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    displayName: string
    role: Role
  }
  interface UserSession {
    /** Milliseconds since the epoch; the server refuses sessions older than the configured maximum age. */
    loggedInAt: number
    /** Copied from users.session_version at sign-in; bumping it in the database ends every session of that user. */
    sessionVersion: number
  }
}

export {}
