import type { Role } from './roles'

declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    role: Role
    jurisdictionId: number | null
  }
}

export {}
