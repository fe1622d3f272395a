import { describe, expect, it } from 'vitest'
import { FILING_ACTIONS, FILING_STATES, FROZEN_STATES, allowedActions, nextState, refusal, visibleToJurisdiction } from '#shared/filings'

// The filing life cycle is our own product rule (shared/filings/states.ts); these are its table.
describe('filing state machine', () => {
  it.each([
    ['draft', 'submit', 'filed'],
    ['returned', 'submit', 'refiled'],
    ['filed', 'take-up', 'in-review'],
    ['refiled', 'take-up', 'in-review'],
    ['in-review', 'accept', 'accepted'],
    ['in-review', 'return', 'returned'],
  ] as const)('%s --%s--> %s', (from, action, to) => {
    expect(nextState(from, action)).toBe(to)
  })

  it('allows nothing else (every other pair is refused)', () => {
    const allowed = new Set(['draft:submit', 'returned:submit', 'filed:take-up', 'refiled:take-up', 'in-review:accept', 'in-review:return'])
    for (const s of FILING_STATES) {
      for (const a of FILING_ACTIONS) {
        if (!allowed.has(`${s}:${a}`)) expect(nextState(s, a), `${s}:${a}`).toBeNull()
      }
    }
  })

  it('accepted is final; a filed record cannot be decided before it is taken up', () => {
    expect(allowedActions('accepted')).toEqual([])
    expect(nextState('filed', 'accept')).toBeNull()
    expect(nextState('filed', 'return')).toBeNull()
    expect(nextState('accepted', 'submit')).toBeNull()
  })

  it('says why an action is refused, and what is possible', () => {
    expect(refusal('filed', 'accept')).toBe('This filing is filed; it cannot be accepted now (it can be taken up for review).')
    expect(refusal('accepted', 'return')).toBe('This filing is accepted; it cannot be returned now.')
  })

  it('drafts stay with the rater; filed, in-review and accepted freeze the test', () => {
    expect(visibleToJurisdiction('draft')).toBe(false)
    expect(FILING_STATES.filter(visibleToJurisdiction)).toEqual(['filed', 'in-review', 'returned', 'refiled', 'accepted'])
    expect([...FROZEN_STATES].sort()).toEqual(['accepted', 'filed', 'in-review', 'refiled'])
  })
})
