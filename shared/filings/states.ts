/**
 * The life of a filing, in our own plain words. One tuple feeds the database enum, the zod enum
 * and the TS type; the transition table below is the only place that says what may follow what.
 *
 *   draft ──submit──▶ filed ──take up──▶ in-review ──accept──▶ accepted
 *                                            │
 *                                          return (reason required)
 *                                            ▼
 *                     refiled ◀──submit── returned
 *                        └──────take up──▶ in-review …
 */
export const FILING_STATES = ['draft', 'filed', 'in-review', 'returned', 'refiled', 'accepted'] as const
export type FilingState = (typeof FILING_STATES)[number]

export const FILING_ACTIONS = ['submit', 'take-up', 'accept', 'return'] as const
export type FilingAction = (typeof FILING_ACTIONS)[number]

export const FILING_STATE_WORDS: Record<FilingState, { title: string, detail: string }> = {
  'draft': { title: 'Draft', detail: 'Being prepared by the rater; the jurisdiction does not see it yet.' },
  'filed': { title: 'Filed', detail: 'Filed with the jurisdiction and waiting for a plan reviewer.' },
  'in-review': { title: 'In review', detail: 'A plan reviewer has taken it up.' },
  'returned': { title: 'Returned', detail: 'Sent back to the rater with reasons; the rater may revise it and file it again.' },
  'refiled': { title: 'Filed again', detail: 'Revised after a return and waiting for a plan reviewer.' },
  'accepted': { title: 'Accepted', detail: 'Accepted by the jurisdiction; a certificate was issued.' },
}

/** What someone did, for the record: "Desmond took up revision 2". */
export const FILING_ACTION_WORDS: Record<FilingAction, string> = {
  'submit': 'filed',
  'take-up': 'took up',
  'accept': 'accepted',
  'return': 'returned',
}

/** What can be done to a filing, for refusals: "it cannot be accepted now". */
const FILING_ACTION_PARTICIPLES: Record<FilingAction, string> = {
  'submit': 'filed',
  'take-up': 'taken up for review',
  'accept': 'accepted',
  'return': 'returned',
}

/** Who may take each action (the routes also check ownership and jurisdiction). */
export const ACTION_ROLE: Record<FilingAction, 'rater' | 'reviewer'> = {
  'submit': 'rater',
  'take-up': 'reviewer',
  'accept': 'reviewer',
  'return': 'reviewer',
}

const TRANSITIONS: Record<FilingAction, Partial<Record<FilingState, FilingState>>> = {
  'submit': { draft: 'filed', returned: 'refiled' },
  'take-up': { 'filed': 'in-review', 'refiled': 'in-review' },
  'accept': { 'in-review': 'accepted' },
  'return': { 'in-review': 'returned' },
}

/** The state an action leads to from `state`, or null when the action is not allowed there. */
export function nextState(state: FilingState, action: FilingAction): FilingState | null {
  return TRANSITIONS[action][state] ?? null
}

/** The actions allowed from a state. */
export function allowedActions(state: FilingState): FilingAction[] {
  return FILING_ACTIONS.filter(a => nextState(state, a) !== null)
}

/** States a plan reviewer still has to act on. */
export const WAITING_STATES: readonly FilingState[] = ['filed', 'refiled', 'in-review']

/** States in which the rater's project and test are frozen (a reviewer has or may have them). */
export const FROZEN_STATES: readonly FilingState[] = ['filed', 'refiled', 'in-review', 'accepted']

/** The jurisdiction sees a filing once it has been filed (never a draft). */
export function visibleToJurisdiction(state: FilingState): boolean {
  return state !== 'draft'
}

/** Why an action is refused in a state, in words (for the 409). */
export function refusal(state: FilingState, action: FilingAction): string {
  const now = FILING_STATE_WORDS[state].title.toLowerCase()
  const allowed = allowedActions(state)
  return `This filing is ${now}; it cannot be ${FILING_ACTION_PARTICIPLES[action]} now${allowed.length ? ` (it can be ${allowed.map(a => FILING_ACTION_PARTICIPLES[a]).join(' or ')})` : ''}.`
}
