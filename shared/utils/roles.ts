export const ROLES = ['operator', 'engineer', 'supervisor', 'admin'] as const
export type Role = typeof ROLES[number]

/** Who may do what (docs/design.md §D2.1). The server checks these per route; the client only mirrors them. */
export const CAPABILITY = {
  view: ['operator', 'engineer', 'supervisor', 'admin'],
  respond: ['operator', 'engineer', 'supervisor'],
  configure: ['engineer'],
  review: ['supervisor'],
  administer: ['admin'],
} as const satisfies Record<string, readonly Role[]>

export type Capability = keyof typeof CAPABILITY

export function can(role: Role | undefined, capability: Capability): boolean {
  return !!role && (CAPABILITY[capability] as readonly Role[]).includes(role)
}
