// The look of a form's fields and their labels on the workbench and admin forms, so every field
// reads the same way.
export const FIELD_CLASS = 'mt-1 block w-full rounded border border-surface-line bg-surface px-2 py-1'
export const LABEL_CLASS = 'block text-sm'
