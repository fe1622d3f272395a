/** One tuple each feeds the database enum, the zod enum and the TS type. */
export const TEST_STAGES = ['rough-in', 'final', 'retest'] as const
export type TestStage = (typeof TEST_STAGES)[number]
export const TEST_STAGE_WORDS: Record<TestStage, string> = { 'rough-in': 'Rough-in', 'final': 'Final', 'retest': 'Retest' }

export const WIND_CONDITIONS = ['calm', 'light', 'gusty'] as const
export type WindCondition = (typeof WIND_CONDITIONS)[number]

/** The ids of the pre-test safety checklist (app/components/safety/SafetyChecklist.vue shows their words). */
export const SAFETY_CHECK_IDS = ['combustion', 'fire', 'dust', 'people', 'openings'] as const
export type SafetyCheckId = (typeof SAFETY_CHECK_IDS)[number]

export const UPLOAD_KINDS = ['readings', 'photo', 'document'] as const
export type UploadKind = (typeof UPLOAD_KINDS)[number]

export const MAIL_STATUSES = ['queued', 'sending', 'sent', 'failed'] as const
export type MailStatus = (typeof MAIL_STATUSES)[number]

export const MAIL_KINDS = ['filing-submitted', 'filing-returned', 'filing-accepted'] as const
export type MailKind = (typeof MAIL_KINDS)[number]

/** Upload size cap (bytes) unless TIGHTWELL_UPLOAD_MAX_MB says otherwise. */
export const DEFAULT_UPLOAD_MAX_MB = 20
