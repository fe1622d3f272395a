// Navigation comfort only: every API route checks the session and role on the server.
const PUBLIC_PAGES = new Set(['/sign-in'])
// Certificate verification is open to anyone holding a code, signed in or not.
const OPEN_PREFIXES = ['/verify/']

export default defineNuxtRouteMiddleware((to) => {
  const { loggedIn, user } = useUserSession()
  if (OPEN_PREFIXES.some(p => to.path.startsWith(p))) return
  if (PUBLIC_PAGES.has(to.path)) {
    if (loggedIn.value) return navigateTo('/')
    return
  }
  if (!loggedIn.value) return navigateTo({ path: '/sign-in', query: to.fullPath !== '/' ? { next: to.fullPath } : {} })
  const needs = to.meta.roles as string[] | undefined
  if (needs && user.value && !needs.includes(user.value.role)) return navigateTo('/')
})
