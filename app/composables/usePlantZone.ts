/**
 * The plant's time zone, in which every screen shows times (docs/design.md §D9). One site per
 * installation today; until the sites are read (or for a viewer without them) it is UTC, named.
 */
export function usePlantZone() {
  const { data } = useFetch<{ timeZone: string }[]>('/api/sites', { key: 'sites', default: () => [] })
  return computed(() => data.value?.[0]?.timeZone ?? 'UTC')
}
