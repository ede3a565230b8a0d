/**
 * A page's buttons that change something: each runs its request, reads the page's data again and
 * says what happened — `notice` when it worked, the server's message (or `failed`) in
 * `actionError` when not. `refreshAfterFailure` reads the data again after a refusal too, for a
 * page whose controls already show the refused value (a role select).
 */
export function usePageAction(refresh: () => Promise<unknown>, options: { refreshAfterFailure?: boolean } = {}) {
  const actionError = ref('')
  const notice = ref('')
  async function act(request: () => Promise<unknown>, messages: { done?: string, failed: string }): Promise<void> {
    actionError.value = ''
    notice.value = ''
    try {
      await request()
      notice.value = messages.done ?? ''
      await refresh()
    }
    catch (err) {
      actionError.value = errorMessage(err, messages.failed)
      if (options.refreshAfterFailure) await refresh()
    }
  }
  return { actionError, notice, act }
}
