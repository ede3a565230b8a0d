// The browser asks /api/_auth/session who is signed in; a session the account no longer allows
// (disabled, role changed, ended, idle) answers 401 there too, so the page shows sign-in instead
// of a header for a user whose every call would fail.
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    if (session.user) await refuseStaleSession(event, session as never)
  })
})
