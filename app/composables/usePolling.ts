// The one polling mechanism (docs/style.md §C10): client-only, paused while the tab is hidden, and
// backing off (doubling, up to 8× the interval) while requests fail so a struggling server is
// not hammered. `failed` is the fetch's error ref.
export function usePolling(refresh: () => Promise<unknown>, ms = 5_000, failed?: Ref<unknown>) {
  const interval = ref(ms)
  const { pause, resume } = useIntervalFn(async () => {
    await refresh()
    interval.value = failed?.value ? Math.min(interval.value * 2, ms * 8) : ms
  }, interval, { immediate: false })
  if (import.meta.client)
    watch(useDocumentVisibility(), v => (v === 'visible' ? resume() : pause()), { immediate: true })
  return { pause, resume }
}
