import type { Role } from '#shared/types/roles'

/** The admin's list of people, with the small state-changing actions the page calls. */
export function usePeople() {
  const { data, pending, error, refresh } = useFetch('/api/users', { key: 'users', default: () => [] })

  async function create(input: { email: string, name: string, role: Role, password: string, jurisdictionId: number | null }) {
    await $fetch('/api/users', { method: 'POST', body: input })
    await refreshNuxtData('users')
  }
  async function changeRole(id: number, role: Role, jurisdictionId: number | null) {
    await $fetch(`/api/users/${id}/role`, { method: 'POST', body: { role, jurisdictionId } })
    await refreshNuxtData('users')
  }
  async function setActive(id: number, active: boolean) {
    await $fetch(`/api/users/${id}/${active ? 'reactivate' : 'deactivate'}`, { method: 'POST' })
    await refreshNuxtData('users')
  }

  return { people: data, pending, error, refresh, create, changeRole, setActive }
}
