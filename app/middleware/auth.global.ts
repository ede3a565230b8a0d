// Sends signed-out visitors to sign-in. Convenience only: every API route checks the role itself.
export default defineNuxtRouteMiddleware((to) => {
  if (to.path === '/sign-in' || to.path === '/set-password') return
  if (!useUserSession().loggedIn.value) return navigateTo({ path: '/sign-in', query: { redirect: to.fullPath } })
})
