import type { Role } from '#shared/types/roles'

export interface NavItem { to: string, label: string }

/** Navigation per role; later features add their entries here. */
export function navigationFor(role: Role): NavItem[] {
  const items: NavItem[] = [{ to: '/', label: 'Dashboard' }, { to: '/calculator', label: 'Calculator' }]
  if (role === 'admin') items.push({ to: '/admin/people', label: 'People' })
  items.push({ to: '/account', label: 'Account' })
  return items
}
