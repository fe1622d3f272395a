/** The three roles. One tuple feeds the database enum, the zod enum and the TS type. */
export const ROLES = ['admin', 'rater', 'reviewer'] as const
export type Role = (typeof ROLES)[number]

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  rater: 'Rater',
  reviewer: 'Plan reviewer',
}

export const JURISDICTION_KINDS = ['state', 'county', 'city', 'program'] as const
export type JurisdictionKind = (typeof JURISDICTION_KINDS)[number]
