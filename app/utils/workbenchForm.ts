/** The fields of `after` that differ from `before`: what an edit form sends as its patch. */
export function changedOnly<T extends Record<string, unknown>>(before: Partial<T>, after: T): Partial<T> {
  return Object.fromEntries(Object.entries(after).filter(([k, v]) => JSON.stringify(before[k]) !== JSON.stringify(v))) as Partial<T>
}
