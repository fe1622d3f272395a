/** One tuple feeds the database enum, the zod enum and the TS type. */
export const VERDICTS = ['complies', 'does-not-comply', 'borderline', 'no-rule'] as const
export type Verdict = (typeof VERDICTS)[number]
