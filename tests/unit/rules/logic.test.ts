import { describe, expect, it } from 'vitest'
import {
  RULE_LIMITS, RULE_VARIABLES, asSimpleRule, evaluateRule, missingVariables, parseRule, roundSignificant, ruleInWords,
  ruleTerms, ruleVariables, simpleRule, validateRule, verdictInWords, type RuleLogic,
} from '#shared/rules'

const ach = (op: string, limit: number): RuleLogic => ({ [op]: [{ var: 'ach50' }, limit] })
const nest = (depth: number): unknown => {
  let rule: unknown = ach('<=', 3)
  for (let i = 1; i < depth; i++) rule = { '!': rule }
  return rule
}

describe('validateRule: only the whitelist, only known variables, bounded size', () => {
  it.each([
    ['a simple limit', ach('<=', 3)],
    ['alternative metrics (or)', { or: [ach('<=', 3), { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.28] }] }],
    ['an attached-unit exception', { if: [{ '==': [{ var: 'buildingType' }, 'attached'] }, { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.3] }, ach('<=', 3)] }],
    ['arithmetic inside a comparison', { '<=': [{ '/': [{ '*': [{ var: 'cfm50' }, 60] }, { var: 'volume' }] }, 3] }],
    ['in with a list', { in: [{ var: 'zone' }, ['4C', '5C']] }],
    ['"between" (3-argument <)', { '<': [0, { var: 'ach50' }, 7] }],
    ['var written as a list', { '<=': [{ var: ['ach50'] }, 3] }],
    ['negation', { '!': { '>': [{ var: 'ach50' }, 3] } }],
    ['min / max', { '<=': [{ max: [{ var: 'ach50' }, { var: 'n50' }] }, 3] }],
    [`a rule exactly ${RULE_LIMITS.maxDepth} levels deep`, nest(RULE_LIMITS.maxDepth - 1)],
  ])('accepts %s', (_label, rule) => {
    expect(validateRule(rule)).toEqual({ ok: true, problems: [] })
  })

  // Hostile or broken rules; the reason names the place in the rule.
  it.each([
    ['an unknown operator (method calls a JavaScript method)', { method: [{ var: 'ach50' }, 'toString'] }, 'method', /operator "method" is not allowed/],
    ['log', { log: [{ var: 'ach50' }] }, 'log', /not allowed/],
    ['map/filter/reduce', { reduce: [[1, 2], { '+': [{ var: 'current' }, 1] }, 0] }, 'reduce', /not allowed/],
    ['a dotted operator', { 'Math.max': [1, 2] }, 'Math.max', /not allowed/],
    ['an unknown variable', ach('<=', 3) && { '<=': [{ var: 'ach49' }, 3] }, '<=[0].var', /unknown variable "ach49"/],
    ['a prototype path as a variable', { '<=': [{ var: '__proto__' }, 3] }, '<=[0].var', /unknown variable "__proto__"/],
    ['a dotted variable path', { '<=': [{ var: 'ach50.toString' }, 3] }, '<=[0].var', /unknown variable/],
    ['a var with a default', { '<=': [{ var: ['ach50', 0] }, 3] }, '<=[0].var', /var takes one variable name/],
    ['a number compared with text', { '<=': [{ var: 'ach50' }, '3'] }, '<=', /compares a number with text/],
    ['two operators in one object', { '<=': [{ var: 'ach50' }, 3], '>': [{ var: 'ach50' }, 0] }, '', /exactly one operator/],
    ['a non-boolean top', { '+': [{ var: 'ach50' }, 1] }, '+', /must say yes or no/],
    ['no variable at all', { '<=': [1, 3] }, '', /at least one variable/],
    ['a wrong arity', { '>': [{ var: 'ach50' }] }, '>', /compares exactly 2 values/],
    ['an if without else', { if: [ach('<=', 3), true] }, 'if', /odd number/],
    ['in without a list', { in: [{ var: 'zone' }, { var: 'zone' }] }, 'in[1]', /list of constants/],
    ['a bare number', 3, '', /a rule is a json-logic object/],
    ['an array', [ach('<=', 3)], '', /a rule is a json-logic object/],
    ['a long text constant', { '==': [{ var: 'zone' }, 'x'.repeat(65)] }, '==[1]', /limited to 64 characters/],
    [`a rule nested ${RULE_LIMITS.maxDepth + 1} deep`, nest(RULE_LIMITS.maxDepth + 1), expect.any(String), /nested too deep \(more than 12 levels\)/],
    ['a rule nested 1,000 deep', nest(1000), '', /too long/],
    ['too many parts', { or: Array.from({ length: 70 }, (_, i) => ach('<=', i)) }, expect.any(String), /too large \(more than 200 parts\)/],
  ])('refuses %s', (_label, rule, path, reason) => {
    const result = validateRule(rule)
    expect(result.ok).toBe(false)
    expect(result.problems[0]!.path).toEqual(path)
    expect(result.problems[0]!.reason).toMatch(reason)
  })

  it('parseRule reports JSON syntax errors', () => {
    expect(parseRule('{"<=": [').problems[0]!.reason).toMatch(/not valid JSON/)
    expect(parseRule('{"<=": [{"var": "ach50"}, 3]}')).toMatchObject({ ok: true, logic: ach('<=', 3) })
  })

  it('evaluateRule refuses an unchecked rule instead of running it', () => {
    expect(() => evaluateRule({ method: [{ var: 'ach50' }, 'toString'] }, { ach50: 3 })).toThrow(/not allowed/)
  })
})

describe('evaluateRule: CHECKS.md §7 boundary vectors [COMPUTED], with a 10-significant-figure tolerance', () => {
  // House of CHECKS.md §3/§7: volume 18 000 ft³, enclosure 4340 ft²; ACH50 = CFM50·60/volume.
  const volume = 18000
  const enclosure = 4340
  it.each([
    // "not exceeding 3.0" (IECC 2012/2015 R402.4.1.2, zones 3-8) [code-limits.csv READ (secondary)]
    [900, ach('<=', 3), true],
    [901, ach('<=', 3), false],
    // "less than 7" — 2009-edition wording (IECC 2009 402.4.2.1) [code-limits.csv READ (secondary transcriptions)]
    [2100, ach('<', 7), false],
    [2099, ach('<', 7), true],
  ])('CFM50 %s against %j → meets: %s', (cfm50, rule, meets) => {
    expect(evaluateRule(rule, { ach50: cfm50 * 60 / volume })).toBe(meets)
  })

  it('CFM50 1215.2 over 4340 ft² (0.2800 cfm/ft²) meets "≤ 0.28"; 1215.3 does not', () => {
    expect(evaluateRule({ '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.28] }, { cfm50PerEnclosureArea: 1215.2 / enclosure })).toBe(true)
    // Computed inside the rule too.
    expect(evaluateRule({ '<=': [{ '/': [{ var: 'cfm50' }, { var: 'enclosureArea' }] }, 0.28] }, { cfm50: 1215.2, enclosureArea: enclosure })).toBe(true)
    expect(evaluateRule({ '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.28] }, { cfm50PerEnclosureArea: 1215.3 / enclosure })).toBe(false)
  })

  it('the same boundary through SI units carries binary noise that the tolerance absorbs', () => {
    // CHECKS.md §1 exact factors: 1 cfm = 0.028316846592·60 m³/h, 1 ft² = 0.09290304 m², 1 cfm/ft² = 18.288 m³/(h·m²).
    const permeability = (1215.2 * 0.028316846592 * 60) / (4340 * 0.09290304)
    const limit = 0.28 * 18.288
    expect(limit).not.toBe(5.12064) // 5.120640000000001 in binary
    expect(permeability / 18.288).not.toBe(0.28) // 0.27999999999999997
    expect(evaluateRule({ '==': [{ var: 'airPermeability50' }, 5.12064] }, { airPermeability50: limit })).toBe(true)
    expect(evaluateRule({ '<=': [{ var: 'airPermeability50' }, 5.12064] }, { airPermeability50: limit })).toBe(true)
    expect(evaluateRule({ '>=': [{ var: 'cfm50PerEnclosureArea' }, 0.28] }, { cfm50PerEnclosureArea: permeability / 18.288 })).toBe(true)
  })

  it('0.1·3 = 0.3 under the tolerance (CHECKS.md: 0.1·3 ≠ 0.3 in binary floating point)', () => {
    expect(0.1 * 3).not.toBe(0.3)
    expect(evaluateRule({ '==': [{ '*': [{ var: 'ach50' }, 3] }, 0.3] }, { ach50: 0.1 })).toBe(true)
    expect(roundSignificant(0.1 * 3)).toBe(0.3)
  })

  it('a difference beyond 10 significant figures still decides', () => {
    expect(evaluateRule(ach('<=', 3), { ach50: 3.000000001 })).toBe(false)
    expect(evaluateRule(ach('<=', 3), { ach50: 3.0000000001 })).toBe(true)
  })

  it('mechanical ventilation advisory applies below 5 ACH50 [CHECKS.md §7; IRC 2012/2015 R303.4, SECONDARY]', () => {
    const advisory = ach('<', 5)
    expect(evaluateRule(advisory, { ach50: 4.647 })).toBe(true) // CHECKS.md §3 house, 4.647 ACH50
    expect(evaluateRule(advisory, { ach50: 5 })).toBe(false)
  })

  it('alternatives: either metric meeting is enough; a missing metric never meets', () => {
    const rule = { or: [ach('<=', 3), { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.28] }] }
    expect(evaluateRule(rule, { ach50: 4.647, cfm50PerEnclosureArea: 0.28 })).toBe(true)
    expect(evaluateRule(rule, { ach50: 4.647, cfm50PerEnclosureArea: 0.3212 })).toBe(false)
    expect(evaluateRule(rule, { ach50: 2.9 })).toBe(true)
    expect(evaluateRule(rule, { ach50: 4.647 })).toBe(false)
    expect(evaluateRule(ach('<=', 3), {})).toBe(false)
    expect(evaluateRule(ach('<=', 3), { ach50: null })).toBe(false)
    expect(missingVariables(rule, { ach50: 4.647 })).toEqual(['cfm50PerEnclosureArea'])
  })

  it('building type, zone and "between"', () => {
    const rule = { if: [{ '==': [{ var: 'buildingType' }, 'attached'] }, { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.3] }, ach('<=', 3)] }
    expect(evaluateRule(rule, { buildingType: 'attached', cfm50PerEnclosureArea: 0.29, ach50: 9 })).toBe(true)
    expect(evaluateRule(rule, { buildingType: 'detached', cfm50PerEnclosureArea: 0.29, ach50: 9 })).toBe(false)
    expect(evaluateRule({ in: [{ var: 'zone' }, ['4C', '5C']] }, { zone: '5C' })).toBe(true)
    expect(evaluateRule({ '<': [0, { var: 'ach50' }, 7] }, { ach50: 7 })).toBe(false)
  })

  it('every documented variable has a sample the validator evaluates with', () => {
    for (const v of RULE_VARIABLES) {
      const rule = v.type === 'number' ? { '>=': [{ var: v.name }, 0] } : { '==': [{ var: v.name }, 'x'] }
      expect(validateRule(rule).ok, v.name).toBe(true)
      expect(ruleVariables(rule as RuleLogic)).toEqual([v.name])
    }
  })
})

describe('ruleTerms, simpleRule and words', () => {
  it('reads terms in either order and names the combinator', () => {
    expect(ruleTerms(ach('<=', 3))).toEqual({ combinator: 'single', terms: [{ metric: 'ach50', comparison: '<=', limit: 3 }] })
    expect(ruleTerms({ '>=': [3, { var: 'ach50' }] })).toEqual({ combinator: 'single', terms: [{ metric: 'ach50', comparison: '<=', limit: 3 }] })
    expect(ruleTerms({ or: [ach('<=', 3), { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.28] }] })).toEqual({
      combinator: 'or',
      terms: [{ metric: 'ach50', comparison: '<=', limit: 3 }, { metric: 'cfm50PerEnclosureArea', comparison: '<=', limit: 0.28 }],
    })
    expect(ruleTerms({ and: [ach('<=', 3), ach('>', 0)] }).combinator).toBe('and')
    const complex = ruleTerms({ if: [{ '==': [{ var: 'buildingType' }, 'attached'] }, { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.3] }, ach('<=', 3)] })
    expect(complex.combinator).toBe('complex')
    expect(complex.terms).toEqual([{ metric: 'cfm50PerEnclosureArea', comparison: '<=', limit: 0.3 }, { metric: 'ach50', comparison: '<=', limit: 3 }])
  })

  it('simpleRule writes the json-logic; asSimpleRule reads it back only when it is one comparison', () => {
    expect(simpleRule('ach50', '<=', 3)).toEqual({ '<=': [{ var: 'ach50' }, 3] })
    expect(asSimpleRule(simpleRule('n50', '<', 0.6))).toEqual({ metric: 'n50', comparison: '<', limit: 0.6 })
    expect(asSimpleRule({ or: [ach('<=', 3)] })).toBeNull()
    expect(asSimpleRule({ '>=': [3, { var: 'ach50' }] })).toBeNull()
  })

  it.each([
    [ach('<=', 3), 'ACH50 ≤ 3'],
    [{ or: [ach('<=', 3), { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.28] }] }, 'ACH50 ≤ 3 or CFM50 per ft² of enclosure ≤ 0.28'],
    [{ and: [ach('<', 7), { or: [ach('>', 1), { '==': [{ var: 'buildingType' }, 'attached'] }] }] }, 'ACH50 < 7 and (ACH50 > 1 or building type = "attached")'],
    [{ '<=': [{ '/': [{ var: 'cfm50' }, { var: 'enclosureArea' }] }, 0.28] }, '(CFM50 ÷ enclosure area) ≤ 0.28'],
    [{ in: [{ var: 'zone' }, ['4C', '5C']] }, 'climate zone is one of "4C", "5C"'],
    [{ if: [{ '==': [{ var: 'buildingType' }, 'attached'] }, { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.3] }, ach('<=', 3)] }, 'if building type = "attached" then CFM50 per ft² of enclosure ≤ 0.3, else ACH50 ≤ 3'],
  ])('reads %j as words', (rule, words) => {
    expect(ruleInWords(rule)).toBe(words)
  })

  it('the editor preview says what a rule decides for given values', () => {
    expect(verdictInWords(ach('<=', 3), { ach50: 3.2 })).toBe('with ACH50 = 3.2 this rule says: does not meet')
    expect(verdictInWords(ach('<=', 3), { ach50: 3 })).toBe('with ACH50 = 3 this rule says: meets')
    expect(verdictInWords(ach('<', 5), { ach50: 3.2 }, 'advisory')).toBe('with ACH50 = 3.2 this rule says: applies')
    expect(verdictInWords(ach('<=', 3), {})).toBe('with ACH50 = unknown this rule says: does not meet')
  })
})
