// Styles shared by the workbench's forms, so every field reads the same way.
export const FIELD_CLASS = 'mt-1 block w-full rounded border border-surface-line bg-surface px-2 py-1'
export const LABEL_CLASS = 'block text-sm'

/** The fields of `after` that differ from `before`: what an edit form sends as its patch. */
export function changedOnly<T extends Record<string, unknown>>(before: Partial<T>, after: T): Partial<T> {
  return Object.fromEntries(Object.entries(after).filter(([k, v]) => JSON.stringify(before[k]) !== JSON.stringify(v))) as Partial<T>
}
