// Spares a signed-out person pages they cannot use; the server checks every request itself.
export default defineNuxtRouteMiddleware((to) => {
  const { loggedIn } = useUserSession()
  if (!loggedIn.value) return navigateTo({ path: '/login', query: { next: to.fullPath } })
})
