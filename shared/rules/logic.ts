/**
 * Logic rules: json-logic (https://jsonlogic.com) limited to a whitelist, validated before they
 * are stored, evaluated by json-logic-js with a documented numeric tolerance, and read back as
 * terms (metric, comparison, limit) and as words.
 */
import * as jsonLogicModule from 'json-logic-js'
import {
  ALLOWED_OPERATORS, COMPARISON_SYMBOLS, COMPARISONS, RULE_LIMITS, RULE_VARIABLE_BY_NAME, RULE_VARIABLES,
  isRuleVariable, type Comparison, type RuleKind, type RuleVariableName,
} from './variables'

/** A JSON value: what a rule is made of. */
export type JsonValue = null | boolean | number | string | JsonValue[] | { [key: string]: JsonValue }
/** A rule: a json-logic expression (an object with one operator key). */
export type RuleLogic = { [operator: string]: JsonValue }

// json-logic-js is a UMD/CommonJS module: depending on the bundler its functions sit on the
// namespace or on its default export.
type JsonLogicApi = { apply: (logic: unknown, data?: unknown) => unknown, truthy: (v: unknown) => boolean, add_operation: (name: string, fn: (...args: unknown[]) => unknown) => void }
const jsonLogic: JsonLogicApi = ((jsonLogicModule as unknown as { default?: JsonLogicApi }).default ?? jsonLogicModule) as unknown as JsonLogicApi

/**
 * Numeric tolerance: every operand of a comparison is rounded to 10 significant figures first.
 * Binary floating point cannot hold most decimals exactly (0.1·3 = 0.30000000000000004; the
 * "≤ 0.28 cfm/ft²" boundary of CHECKS.md §7 taken through SI units is 0.27999999999999997 or
 * 5.120640000000001), and a result exactly at a limit must meet it (CHECKS.md §7: compare
 * unrounded values with a documented tolerance, about 1e-9 relative). 10 significant figures is
 * far finer than any gauge (3–4 figures) and far coarser than double-precision noise (~16).
 */
export const SIGNIFICANT_FIGURES = 10
export function roundSignificant(value: number, figures = SIGNIFICANT_FIGURES): number {
  if (!Number.isFinite(value) || value === 0) return value
  return Number(value.toPrecision(figures))
}

// Our own operator, applied around comparison operands by `prepare`. The name is outside the
// whitelist, so an admin's rule can never use it directly.
const TOLERANCE_OP = 'tightwell_sig10'
let registered = false
function register() {
  if (registered) return
  jsonLogic.add_operation(TOLERANCE_OP, (value: unknown) => {
    if (typeof value === 'number') return roundSignificant(value)
    // A missing variable never satisfies a comparison: NaN compares false with everything.
    if (value === null || value === undefined) return Number.NaN
    return value
  })
  registered = true
}

const COMPARISON_OPS: ReadonlySet<string> = new Set(['==', '!=', '===', '!==', '<', '<=', '>', '>='])
const BOOLEAN_OPS: ReadonlySet<string> = new Set([...COMPARISON_OPS, 'and', 'or', '!', '!!', 'if', 'in'])

export interface RuleProblem {
  /** Where in the rule: "" for the whole rule, "and[1].<=[0]" for a part. */
  path: string
  reason: string
}
export interface RuleValidation {
  ok: boolean
  problems: RuleProblem[]
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value)
}

function argsOf(value: unknown): unknown[] {
  return Array.isArray(value) ? value : [value]
}

interface WalkState { nodes: number, problems: RuleProblem[], variables: Set<RuleVariableName>, tooDeep: boolean }

/**
 * Checks the shape only (no evaluation): the whitelist, arities, known variables, depth and size.
 * Stops descending past the depth cap, so a rule nested 1,000 deep costs 12 levels of work.
 */
function walk(node: unknown, path: string, depth: number, state: WalkState): void {
  state.nodes += 1
  if (state.nodes > RULE_LIMITS.maxNodes) {
    if (state.nodes === RULE_LIMITS.maxNodes + 1) state.problems.push({ path, reason: `the rule is too large (more than ${RULE_LIMITS.maxNodes} parts)` })
    return
  }
  if (node === null || typeof node === 'boolean') return
  if (typeof node === 'number') {
    if (!Number.isFinite(node)) state.problems.push({ path, reason: 'numbers must be finite' })
    return
  }
  if (typeof node === 'string') {
    if (node.length > RULE_LIMITS.maxStringLength) state.problems.push({ path, reason: `text constants are limited to ${RULE_LIMITS.maxStringLength} characters` })
    return
  }
  if (depth > RULE_LIMITS.maxDepth) {
    if (!state.tooDeep) state.problems.push({ path, reason: `the rule is nested too deep (more than ${RULE_LIMITS.maxDepth} levels)` })
    state.tooDeep = true
    return
  }
  if (Array.isArray(node)) {
    // A literal list, e.g. the second argument of `in`.
    node.forEach((item, i) => walk(item, `${path}[${i}]`, depth + 1, state))
    return
  }
  if (!isPlainObject(node)) {
    state.problems.push({ path, reason: 'is not a JSON value' })
    return
  }
  const keys = Object.keys(node)
  if (keys.length !== 1) {
    state.problems.push({ path, reason: keys.length === 0 ? 'an operation needs an operator, e.g. {"<=": [{"var": "ach50"}, 3]}' : `an operation has exactly one operator; found ${keys.map(k => `"${k}"`).join(', ')}` })
    return
  }
  const op = keys[0]!
  const here = path ? `${path}.${op}` : op
  if (!ALLOWED_OPERATORS.has(op)) {
    state.problems.push({ path: here, reason: `operator "${op}" is not allowed; use ${[...ALLOWED_OPERATORS].join(' ')}` })
    return
  }
  const raw = node[op]
  const args = argsOf(raw)
  if (op === 'var') {
    const name = args[0]
    if (args.length !== 1 || typeof name !== 'string') {
      state.problems.push({ path: here, reason: 'var takes one variable name, e.g. {"var": "ach50"}' })
      return
    }
    if (!isRuleVariable(name)) {
      state.problems.push({ path: here, reason: `unknown variable "${name}"; known: ${RULE_VARIABLES.map(v => v.name).join(', ')}` })
      return
    }
    state.variables.add(name)
    return
  }
  const arity = checkArity(op, args)
  if (arity) state.problems.push({ path: here, reason: arity })
  if (op === 'in') {
    const list = args[1]
    const okList = typeof list === 'string' || (Array.isArray(list) && list.every(x => typeof x === 'string' || typeof x === 'number'))
    if (!okList) state.problems.push({ path: `${here}[1]`, reason: 'in needs a list of constants as its second argument, e.g. ["attached", "detached"]' })
  }
  if (COMPARISON_OPS.has(op)) checkComparisonTypes(op, args, here, state)
  args.forEach((arg, i) => walk(arg, `${here}[${i}]`, depth + 1, state))
}

function checkArity(op: string, args: unknown[]): string | undefined {
  const n = args.length
  switch (op) {
    case '<': case '<=':
      return n === 2 || n === 3 ? undefined : `${op} compares 2 values (or 3, "between")`
    case '>': case '>=': case '==': case '!=': case '===': case '!==':
      return n === 2 ? undefined : `${op} compares exactly 2 values`
    case '!': case '!!':
      return n === 1 ? undefined : `${op} takes 1 value`
    case 'and': case 'or':
      return n >= 1 ? undefined : `${op} needs at least 1 value`
    case 'if':
      return n >= 3 && n % 2 === 1 ? undefined : 'if takes condition, then, else (an odd number of values, at least 3)'
    case 'in':
      return n === 2 ? undefined : 'in takes a value and a list'
    case '/':
      return n === 2 ? undefined : '/ divides 2 values'
    case '-':
      return n === 1 || n === 2 ? undefined : '- takes 1 or 2 values'
    case '+': case '*': case 'min': case 'max':
      return n >= 1 ? undefined : `${op} needs at least 1 value`
  }
  return undefined
}

/** A number variable compared with a text constant (or the reverse) can never be true. */
function checkComparisonTypes(op: string, args: unknown[], path: string, state: WalkState) {
  const typeOf = (arg: unknown): 'number' | 'string' | undefined => {
    if (typeof arg === 'number') return 'number'
    if (typeof arg === 'string') return 'string'
    if (isPlainObject(arg) && Object.keys(arg).length === 1 && 'var' in arg) {
      const name = argsOf(arg.var)[0]
      if (isRuleVariable(name)) return RULE_VARIABLE_BY_NAME[name].type
    }
    return undefined
  }
  const types = args.map(typeOf).filter((t): t is 'number' | 'string' => t !== undefined)
  if (types.includes('number') && types.includes('string')) {
    state.problems.push({ path, reason: `${op} compares a number with text; compare numbers with numbers (e.g. 3, not "3")` })
  }
}

/** Rules already checked for shape (by identity), so repeated evaluation stays cheap. */
const checkedShapes = new WeakMap<object, RuleValidation & { variables: RuleVariableName[] }>()

function checkShape(logic: unknown): RuleValidation & { variables: RuleVariableName[] } {
  if (isPlainObject(logic)) {
    const hit = checkedShapes.get(logic)
    if (hit) return hit
  }
  const state: WalkState = { nodes: 0, problems: [], variables: new Set(), tooDeep: false }
  if (!isPlainObject(logic)) {
    state.problems.push({ path: '', reason: 'a rule is a json-logic object, e.g. {"<=": [{"var": "ach50"}, 3]}' })
  }
  else {
    const op = Object.keys(logic)[0]
    if (Object.keys(logic).length === 1 && op !== undefined && ALLOWED_OPERATORS.has(op) && !BOOLEAN_OPS.has(op)) {
      state.problems.push({ path: op, reason: 'a rule must say yes or no: start with a comparison (<, <=, …), and, or, !, if or in' })
    }
    walk(logic, '', 1, state)
    if (state.problems.length === 0 && state.variables.size === 0) {
      state.problems.push({ path: '', reason: 'a rule must use at least one variable (e.g. {"var": "ach50"})' })
    }
  }
  const result = { ok: state.problems.length === 0, problems: state.problems, variables: [...state.variables] }
  if (isPlainObject(logic)) checkedShapes.set(logic, result)
  return result
}

/** Sample inputs every rule is evaluated against before it is saved. */
export function sampleInputs(): RuleInputs[] {
  const typical = Object.fromEntries(RULE_VARIABLES.map(v => [v.name, v.sample])) as RuleInputs
  return [
    typical,
    { ...typical, buildingType: 'attached', zone: '7', zoneNumber: 7 },
    Object.fromEntries(RULE_VARIABLES.map(v => [v.name, v.type === 'number' ? 0 : v.sample])) as RuleInputs,
    Object.fromEntries(RULE_VARIABLES.map(v => [v.name, v.type === 'number' ? 1e6 : v.sample])) as RuleInputs,
    {},
  ]
}

/**
 * Validates a rule: whitelisted operators only, known variables only, depth ≤ 12, ≤ 200 parts,
 * ≤ 4,000 characters as JSON, at least one variable, and it evaluates without error against
 * sample values. `problems` name the place in the rule (path) and the reason.
 */
export function validateRule(logic: unknown): RuleValidation {
  let json: string | undefined
  try {
    json = JSON.stringify(logic)
  }
  catch {
    return { ok: false, problems: [{ path: '', reason: 'is not JSON' }] }
  }
  if (json === undefined) return { ok: false, problems: [{ path: '', reason: 'is missing' }] }
  if (json.length > RULE_LIMITS.maxJsonLength) return { ok: false, problems: [{ path: '', reason: `the rule is too long (${json.length} characters; at most ${RULE_LIMITS.maxJsonLength})` }] }
  const shape = checkShape(logic)
  if (!shape.ok) return { ok: false, problems: shape.problems }
  for (const inputs of sampleInputs()) {
    try {
      evaluateRule(logic as RuleLogic, inputs)
    }
    catch (error) {
      return { ok: false, problems: [{ path: '', reason: `does not evaluate: ${(error as Error).message}` }] }
    }
  }
  return { ok: true, problems: [] }
}

/** Parses rule text (the advanced editor) and validates it; JSON syntax errors become problems. */
export function parseRule(text: string): RuleValidation & { logic?: RuleLogic } {
  let logic: unknown
  try {
    logic = JSON.parse(text)
  }
  catch (error) {
    return { ok: false, problems: [{ path: '', reason: `is not valid JSON (${(error as Error).message})` }] }
  }
  const result = validateRule(logic)
  return result.ok ? { ...result, logic: logic as RuleLogic } : result
}

export type RuleInputs = Partial<Record<RuleVariableName, number | string | null>>

/** Wraps each comparison operand in the tolerance operator. */
function prepare(node: JsonValue): JsonValue {
  if (Array.isArray(node)) return node.map(prepare)
  if (!isPlainObject(node)) return node
  const op = Object.keys(node)[0]!
  const value = node[op] as JsonValue
  if (op === 'var') return node
  const args = argsOf(value) as JsonValue[]
  if (COMPARISON_OPS.has(op)) return { [op]: args.map(arg => ({ [TOLERANCE_OP]: [prepare(arg)] })) }
  if (op === 'in') return { in: [prepare(args[0]!), args[1]!] }
  return { [op]: args.map(prepare) }
}
const prepared = new WeakMap<object, JsonValue>()

export class RuleError extends Error {
  constructor(readonly problems: RuleProblem[]) {
    super(problems.map(p => (p.path ? `${p.path}: ${p.reason}` : p.reason)).join('; '))
    this.name = 'RuleError'
  }
}

/**
 * Evaluates a rule for a set of inputs. For a `limit` rule, true = meets; for an `advisory`,
 * true = the notice applies. Comparisons use the 10-significant-figure tolerance above; a
 * comparison with a missing (null/undefined) input is false. Throws RuleError for a rule that
 * fails the shape check — json-logic-js never sees an unchecked rule.
 */
export function evaluateRule(logic: RuleLogic, inputs: RuleInputs): boolean {
  const shape = checkShape(logic)
  if (!shape.ok) throw new RuleError(shape.problems)
  register()
  let ready = prepared.get(logic)
  if (!ready) {
    ready = prepare(logic)
    prepared.set(logic, ready)
  }
  // Only known variables reach json-logic-js, as plain numbers and strings.
  const data: Record<string, number | string | null> = {}
  for (const name of shape.variables) {
    const v = inputs[name]
    data[name] = typeof v === 'number' || typeof v === 'string' ? v : null
  }
  return jsonLogic.truthy(jsonLogic.apply(ready, data))
}

/** The variables a (valid) rule reads. */
export function ruleVariables(logic: RuleLogic): RuleVariableName[] {
  return checkShape(logic).variables
}

/** The variables a rule reads that the inputs lack. */
export function missingVariables(logic: RuleLogic, inputs: RuleInputs): RuleVariableName[] {
  return ruleVariables(logic).filter(name => inputs[name] === undefined || inputs[name] === null)
}

/** One comparison of a variable with a constant: "ach50 ≤ 3". */
export interface RuleTerm {
  metric: RuleVariableName
  comparison: Comparison
  limit: number
}
export interface RuleTerms {
  /** single: one term; or/and: alternatives / all required; complex: anything else (terms are the simple comparisons found inside). */
  combinator: 'single' | 'or' | 'and' | 'complex'
  terms: RuleTerm[]
}

const FLIP: Record<Comparison, Comparison> = { '<': '>', '<=': '>=', '>': '<', '>=': '<=', '==': '==', '!=': '!=' }

function varName(node: unknown): RuleVariableName | undefined {
  if (!isPlainObject(node) || Object.keys(node).length !== 1 || !('var' in node)) return undefined
  const name = argsOf(node.var)[0]
  return isRuleVariable(name) ? name : undefined
}

/** Reads `{"<=": [{"var": "ach50"}, 3]}` (either order) as a term; anything else → null. */
export function termOf(node: unknown): RuleTerm | null {
  if (!isPlainObject(node) || Object.keys(node).length !== 1) return null
  const op = Object.keys(node)[0]!
  const normalised = op === '===' ? '==' : op === '!==' ? '!=' : op
  if (!(COMPARISONS as readonly string[]).includes(normalised)) return null
  const args = argsOf(node[op])
  if (args.length !== 2) return null
  const [a, b] = args
  const left = varName(a)
  const right = varName(b)
  if (left && typeof b === 'number' && RULE_VARIABLE_BY_NAME[left].type === 'number') return { metric: left, comparison: normalised as Comparison, limit: b }
  if (right && typeof a === 'number' && RULE_VARIABLE_BY_NAME[right].type === 'number') return { metric: right, comparison: FLIP[normalised as Comparison], limit: a }
  return null
}

function collectTerms(node: unknown, into: RuleTerm[]) {
  const term = termOf(node)
  if (term) { into.push(term); return }
  if (Array.isArray(node)) { node.forEach(n => collectTerms(n, into)); return }
  if (isPlainObject(node)) for (const value of Object.values(node)) collectTerms(value, into)
}

/**
 * The comparisons of one variable with a constant in a rule, and how they combine. The checker
 * reports metric, limit and margin from these; "or" means alternatives (any one meeting is enough).
 */
export function ruleTerms(logic: RuleLogic): RuleTerms {
  const single = termOf(logic)
  if (single) return { combinator: 'single', terms: [single] }
  const op = Object.keys(logic)[0]
  if ((op === 'or' || op === 'and') && Object.keys(logic).length === 1) {
    const children = argsOf(logic[op])
    const terms = children.map(termOf)
    if (terms.every((t): t is RuleTerm => t !== null)) return { combinator: op, terms }
  }
  const terms: RuleTerm[] = []
  collectTerms(logic, terms)
  return { combinator: 'complex', terms }
}

/** A one-comparison rule: simpleRule('ach50', '<=', 3) → {"<=": [{"var": "ach50"}, 3]}. */
export function simpleRule(metric: RuleVariableName, comparison: Comparison, limit: number): RuleLogic {
  return { [comparison]: [{ var: metric }, limit] }
}

/** The simple editor's view of a rule, when it is one comparison of a metric with a number. */
export function asSimpleRule(logic: RuleLogic): RuleTerm | null {
  const term = termOf(logic)
  if (!term) return null
  // Only the canonical orientation round-trips through the simple editor unchanged.
  const op = Object.keys(logic)[0]!
  const args = argsOf(logic[op])
  return varName(args[0]) ? term : null
}

function formatNumber(n: number): string {
  return String(roundSignificant(n))
}

function words(node: unknown, top = false): string {
  if (node === null) return 'nothing'
  if (typeof node === 'number') return formatNumber(node)
  if (typeof node === 'string') return `"${node}"`
  if (typeof node === 'boolean') return node ? 'true' : 'false'
  if (Array.isArray(node)) return node.map(n => words(n)).join(', ')
  if (!isPlainObject(node)) return '?'
  const op = Object.keys(node)[0]!
  const args = argsOf(node[op])
  const wrap = (s: string) => (top ? s : `(${s})`)
  switch (op) {
    case 'var': {
      const name = args[0]
      return isRuleVariable(name) ? RULE_VARIABLE_BY_NAME[name].label : String(name)
    }
    // Comparisons bind tighter than and/or, so they need no parentheses.
    case '<': case '<=':
      if (args.length === 3) return `${words(args[0])} ${COMPARISON_SYMBOLS[op]} ${words(args[1])} ${COMPARISON_SYMBOLS[op]} ${words(args[2])}`
      return `${words(args[0])} ${COMPARISON_SYMBOLS[op]} ${words(args[1])}`
    case '>': case '>=': case '==': case '!=':
      return `${words(args[0])} ${COMPARISON_SYMBOLS[op]} ${words(args[1])}`
    case '===': return `${words(args[0])} = ${words(args[1])}`
    case '!==': return `${words(args[0])} ≠ ${words(args[1])}`
    case 'and': return wrap(args.map(a => words(a)).join(' and '))
    case 'or': return wrap(args.map(a => words(a)).join(' or '))
    case '!': return `not ${words(args[0])}`
    case '!!': return words(args[0], top)
    case 'in': return (`${words(args[0])} is one of ${Array.isArray(args[1]) ? args[1].map(a => words(a)).join(', ') : words(args[1])}`)
    case 'if': {
      const parts: string[] = []
      let i = 0
      for (; i + 1 < args.length; i += 2) parts.push(`${i === 0 ? 'if' : 'else if'} ${words(args[i], true)} then ${words(args[i + 1], true)}`)
      if (i < args.length) parts.push(`else ${words(args[i], true)}`)
      return wrap(parts.join(', '))
    }
    case '+': return wrap(args.map(a => words(a)).join(' + '))
    case '-': return args.length === 1 ? `−${words(args[0])}` : wrap(`${words(args[0])} − ${words(args[1])}`)
    case '*': return wrap(args.map(a => words(a)).join(' × '))
    case '/': return wrap(`${words(args[0])} ÷ ${words(args[1])}`)
    case 'min': return `the smaller of ${args.map(a => words(a)).join(', ')}`
    case 'max': return `the larger of ${args.map(a => words(a)).join(', ')}`
  }
  return `${op}(${args.map(a => words(a)).join(', ')})`
}

/** A rule read as words: "ACH50 ≤ 3 or CFM50 per ft² of enclosure ≤ 0.28". */
export function ruleInWords(logic: unknown): string {
  return words(logic, true)
}

/**
 * The preview line of the advanced editor: "with ACH50 = 3.2 this rule says: does not meet".
 * Only the variables the rule reads are named.
 */
export function verdictInWords(logic: RuleLogic, inputs: RuleInputs, kind: RuleKind = 'limit'): string {
  const shape = checkShape(logic)
  if (!shape.ok) return `this rule cannot be evaluated: ${shape.problems[0]?.reason ?? 'invalid'}`
  const given = shape.variables.map((name) => {
    const v = inputs[name]
    return `${RULE_VARIABLE_BY_NAME[name].label} = ${v === undefined || v === null ? 'unknown' : typeof v === 'number' ? formatNumber(v) : v}`
  })
  const result = evaluateRule(logic, inputs)
  const says = kind === 'limit' ? (result ? 'meets' : 'does not meet') : (result ? 'applies' : 'does not apply')
  return `with ${given.join(', ')} this rule says: ${says}`
}

/** JSON with sorted keys, for comparing rules regardless of key order. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`
  if (isPlainObject(value)) return `{${Object.keys(value).sort().map(k => `${JSON.stringify(k)}:${canonicalJson(value[k])}`).join(',')}}`
  return JSON.stringify(value) ?? 'null'
}
