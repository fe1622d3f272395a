// Navigation comfort only: every API route checks the session and role on the server.
const PUBLIC_PAGES = new Set(['/sign-in'])

export default defineNuxtRouteMiddleware((to) => {
  const { loggedIn, user } = useUserSession()
  if (PUBLIC_PAGES.has(to.path)) {
    if (loggedIn.value) return navigateTo('/')
    return
  }
  if (!loggedIn.value) return navigateTo({ path: '/sign-in', query: to.fullPath !== '/' ? { next: to.fullPath } : {} })
  const needs = to.meta.roles as string[] | undefined
  if (needs && user.value && !needs.includes(user.value.role)) return navigateTo('/')
})
