/** Who acts (null = the system) and the public address links in messages point to. */
export function changeContext(userId: number | null): ChangeContext {
  return { userId, publicUrl: useRuntimeConfig().publicUrl }
}
