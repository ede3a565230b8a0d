// The one polling mechanism (STYLE.md §3.8): client-only, paused while the tab is hidden, and
// backing off (up to 8× the interval) while requests fail so a struggling server is not hammered.
export function usePolling(refresh: () => Promise<unknown>, ms = 5_000, hasError?: Ref<unknown>) {
  const delay = ref(ms)
  const { pause, resume } = useTimeoutFn(async () => {
    await refresh()
    delay.value = hasError?.value ? Math.min(delay.value * 2, ms * 8) : ms
    if (visible.value === 'visible') resume()
  }, delay, { immediate: false })
  const visible = useDocumentVisibility()
  if (import.meta.client)
    watch(visible, v => (v === 'visible' ? resume() : pause()), { immediate: true })
  return { pause, resume }
}
