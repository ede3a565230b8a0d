/**
 * The fields a change touched, each with its value before and after: what the audit log keeps of
 * a configuration change (docs/design.md: every change audited with before and after).
 */
export function changedFields<T extends object>(
  before: T, after: T, keys: readonly (keyof T)[],
): Record<string, { from: unknown, to: unknown }> {
  const out: Record<string, { from: unknown, to: unknown }> = {}
  for (const key of keys) {
    const from = before[key]
    const to = after[key]
    const same = from instanceof Date && to instanceof Date ? from.getTime() === to.getTime() : JSON.stringify(from) === JSON.stringify(to)
    if (!same) out[String(key)] = { from, to }
  }
  return out
}
