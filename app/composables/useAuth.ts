/** Sign-in and sign-out for pages: thin wrappers over the auth routes and nuxt-auth-utils' session. */
export function useAuth() {
  const { fetch: refreshSession, clear } = useUserSession()

  async function signIn(email: string, password: string) {
    await $fetch('/api/auth/sign-in', { method: 'POST', body: { email, password } })
    await refreshSession()
  }

  async function signOut() {
    await $fetch('/api/auth/sign-out', { method: 'POST' })
    await clear()
    await navigateTo('/sign-in')
  }

  return { signIn, signOut }
}
