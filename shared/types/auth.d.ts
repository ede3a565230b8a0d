declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    role: 'operator' | 'engineer' | 'supervisor' | 'admin'
  }
}
export {}
