import type { Role } from '#shared/types/roles'

export interface NavItem {
  to: string
  label: string
  /** Other path prefixes that belong to this entry (its section). */
  section?: string[]
  /** Paths under this entry's prefix that belong to another entry. */
  except?: string[]
}

/** Navigation per role. Everyone reads the rule tables; only admins edit them (the server decides). */
export function navigationFor(role: Role): NavItem[] {
  const items: NavItem[] = [
    { to: '/', label: 'Dashboard' },
    // The filing work comes first: raters keep projects and file them, reviewers work the queue.
    ...(role === 'reviewer' ? [] : [{ to: '/projects', label: 'Projects', section: ['/tests'] }]),
    role === 'reviewer' ? { to: '/filings', label: 'Review queue' } : { to: '/filings', label: 'Filings' },
    { to: '/checks/new', label: 'Self-check' },
    { to: '/checks', label: 'My checks', except: ['/checks/new'] },
    { to: '/calculator', label: 'Calculator' },
    { to: '/jurisdictions', label: 'Rule tables', section: ['/zone-maps', '/rule-sets'] },
  ]
  if (role === 'admin') items.push({ to: '/admin/people', label: 'People' }, { to: '/admin/outbox', label: 'Outbox' })
  items.push({ to: '/account', label: 'Account' })
  return items
}

const under = (path: string, prefix: string) => path === prefix || path.startsWith(`${prefix}/`)

/** Whether a navigation entry is the current page's section. */
export function isCurrentNav(item: NavItem, path: string): boolean {
  if (item.to === '/') return path === '/'
  if (item.except?.some(p => under(path, p))) return false
  return [item.to, ...(item.section ?? [])].some(p => under(path, p))
}
