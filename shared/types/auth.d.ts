import type { Role } from '../utils/roles'

declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    role: Role
  }
  interface UserSession {
    /** Epoch ms of sign-in and of the last request (server/utils/auth.ts checks both). */
    loggedInAt?: number
    lastSeenAt?: number
  }
}
export {}
