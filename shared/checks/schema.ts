import { z } from 'zod'
import { calculationShape, withCalculationChecks } from '../leakage/schema'
import { isStateCode, stateForFips } from '../rules/fips'
import { isIsoDate } from '../rules/resolve'
import { BUILDING_TYPES } from '../rules/variables'

/** How far ahead a permit date may lie: permits are dated when issued, not years out. */
export const MAX_PERMIT_YEARS_AHEAD = 2

export const AddressSchema = z.strictObject({
  line1: z.string({ error: 'Street address is required.' }).trim().min(1, 'Street address is required.').max(200, 'Street address must be at most 200 characters.'),
  city: z.string({ error: 'City is required.' }).trim().min(1, 'City is required.').max(100, 'City must be at most 100 characters.'),
  state: z.string({ error: 'State is required (2 letters, e.g. WA).' }).trim().toUpperCase()
    .refine(isStateCode, 'State must be a 2-letter US state or territory code such as WA.'),
  postalCode: z.string({ error: 'Postal code is required.' }).trim()
    .regex(/^\d{5}(-\d{4})?$/, 'Postal code must be 5 digits (ZIP+4 allowed).')
    .transform(s => s.slice(0, 5)),
  countyFips: z.string({ error: 'County FIPS must be text such as "53035".' }).trim()
    .regex(/^\d{5}$/, 'County FIPS must be 5 digits (state 2 + county 3), e.g. 53035.')
    .optional(),
})

/** The latest permit date accepted on `today` (YYYY-MM-DD). */
export function latestPermitDate(today: Date): string {
  const limit = new Date(today)
  limit.setUTCFullYear(limit.getUTCFullYear() + MAX_PERMIT_YEARS_AHEAD)
  return limit.toISOString().slice(0, 10)
}

function permitDate(today: () => Date) {
  return z.string({ error: 'Permit date is required (YYYY-MM-DD).' })
    .refine(isIsoDate, 'Permit date must be a real date written YYYY-MM-DD.')
    .refine(d => d <= latestPermitDate(today()), `Permit date is more than ${MAX_PERMIT_YEARS_AHEAD} years in the future.`)
}

/** The body of POST /api/checks: a calculation request plus where and when. */
export function checkRequestSchema(today: () => Date = () => new Date()) {
  return withCalculationChecks(calculationShape.extend({
    address: AddressSchema,
    permitDate: permitDate(today),
    buildingType: z.enum(BUILDING_TYPES, { error: 'Building type must be "detached" or "attached".' }),
    jurisdictionId: z.number({ error: 'Jurisdiction id must be a number.' }).int('Jurisdiction id must be a whole number.').positive('Jurisdiction id must be positive.').optional(),
  })).superRefine((value, ctx) => {
    const fips = value.address.countyFips
    if (fips && stateForFips(fips) !== value.address.state) {
      ctx.addIssue({ code: 'custom', path: ['address', 'countyFips'], message: `County FIPS ${fips} is not in ${value.address.state}.` })
    }
  })
}

export const CheckRequest = checkRequestSchema()
export type CheckRequest = z.output<typeof CheckRequest>
export type CheckRequestInput = z.input<typeof CheckRequest>
