/**
 * Validation of a calculation request (zod 4). Declared once here so the form and the server
 * share it. The base object (`calculationShape`) has no top-level refinement so other routes can
 * `.extend()` it; apply the cross-field checks with {@link withCalculationChecks}:
 *
 *   const CheckRequest = withCalculationChecks(calculationShape.extend({ address: z.string() }))
 */
import { z } from 'zod'
import { baselineAverage } from './analyze'
import { TEST_DIRECTIONS, type LeakageInput } from './types'

/** Most readings accepted in one test direction. */
export const MAX_READINGS = 50
/** Adjusted pressure range accepted, Pa (after subtracting the baseline). */
export const PRESSURE_RANGE_PA = { min: 1, max: 100 } as const
/** Plausible test temperatures, °C. */
export const TEMPERATURE_RANGE_C = { min: -50, max: 60 } as const
/** The same range in °F, written out (−50 °C = −58 °F, 60 °C = 140 °F) so the bounds are exact. */
export const TEMPERATURE_RANGE_F = { min: -58, max: 140 } as const
/** Accepted assumed flow exponent for a one-reading test. */
export const ASSUMED_EXPONENT_RANGE = { min: 0.4, max: 1.0 } as const

// z.number() already rejects NaN and ±Infinity in zod 4; this only words the reason.
function numberField(label: string) {
  return z.number({
    error: (issue) => (issue.input === undefined ? `${label} is required.` : `${label} must be a finite number.`),
  })
}

function positiveField(label: string) {
  return numberField(label).positive({ error: `${label} must be greater than zero.` })
}

// Strict objects name the unknown fields in the message (the issue's path is the object).
function strict<S extends z.ZodRawShape>(shape: S) {
  return z.strictObject(shape, {
    error: (issue) =>
      issue.code === 'unrecognized_keys'
        ? `Unknown field${issue.keys.length > 1 ? 's' : ''}: ${issue.keys.join(', ')}.`
        : 'Expected an object.',
  })
}

export const unitSystemSchema = z.enum(['ip', 'si'], { error: 'Units must be "ip" or "si".' })
export const testDirectionSchema = z.enum(TEST_DIRECTIONS, {
  error: 'Direction must be "depressurization" or "pressurization".',
})

export const readingShape = strict({
  pressure: numberField('Pressure'),
  flow: positiveField('Flow'),
})

export const baselineShape = strict({
  before: numberField('Baseline before the test').optional(),
  after: numberField('Baseline after the test').optional(),
})

export const buildingShape = strict({
  volume: positiveField('Volume'),
  floorArea: positiveField('Floor area').optional(),
  enclosureArea: positiveField('Enclosure area').optional(),
  height: positiveField('Height').optional(),
  elevation: numberField('Elevation').optional(),
})

export const testShape = strict({
  direction: testDirectionSchema,
  baseline: baselineShape.optional(),
  readings: z
    .array(readingShape, { error: 'Readings must be a list.' })
    .min(1, { error: 'At least one reading is needed.' })
    .max(MAX_READINGS, { error: `At most ${MAX_READINGS} readings are accepted.` }),
  insideTemperature: numberField('Inside temperature').optional(),
  outsideTemperature: numberField('Outside temperature').optional(),
  assumedExponent: numberField('Assumed exponent')
    .min(ASSUMED_EXPONENT_RANGE.min, {
      error: `The assumed flow exponent must be between ${ASSUMED_EXPONENT_RANGE.min} and ${ASSUMED_EXPONENT_RANGE.max} (0.65 is usual).`,
    })
    .max(ASSUMED_EXPONENT_RANGE.max, {
      error: `The assumed flow exponent must be between ${ASSUMED_EXPONENT_RANGE.min} and ${ASSUMED_EXPONENT_RANGE.max} (0.65 is usual).`,
    })
    .optional(),
})

type TestFields = z.output<typeof testShape>

// Minimal view of zod's refinement context: only custom issues with a path are raised here.
interface IssueSink {
  addIssue(issue: { code: 'custom'; message: string; path: PropertyKey[] }): void
}

function pa(value: number): string {
  return `${Number(value.toFixed(2))} Pa`
}

/**
 * Reading checks that need the direction and baseline: sign matches the direction (0 is not an
 * induced pressure and is rejected), adjusted magnitude within 1–100 Pa, no duplicate pressure.
 * Paths are relative to the test object. The limits are product rules (issue 3), not taken
 * from a standard; the sign convention is house relative to outdoors (CHECKS.md §5).
 */
export function checkTestReadings(test: TestFields, ctx: IssueSink): void {
  const depress = test.direction === 'depressurization'
  const sign = depress ? -1 : 1
  const base = baselineAverage(test) ?? 0
  const seen = new Map<number, number>()
  test.readings.forEach((reading, i) => {
    const p = reading.pressure
    if (p * sign <= 0) {
      ctx.addIssue({
        code: 'custom',
        path: ['readings', i, 'pressure'],
        message: depress
          ? `In a depressurization test the house is below outdoor pressure, so readings must be negative (got ${pa(p)}).`
          : `In a pressurization test the house is above outdoor pressure, so readings must be positive (got ${pa(p)}).`,
      })
      return
    }
    const adjusted = (p - base) * sign
    const after = () => (base === 0 ? 'This reading induces' : `After subtracting the baseline of ${pa(base)}, this reading induces`)
    if (adjusted < PRESSURE_RANGE_PA.min) {
      ctx.addIssue({ code: 'custom', path: ['readings', i, 'pressure'], message: `${after()} ${pa(adjusted)}; at least ${PRESSURE_RANGE_PA.min} Pa is needed.` })
    } else if (adjusted > PRESSURE_RANGE_PA.max) {
      ctx.addIssue({ code: 'custom', path: ['readings', i, 'pressure'], message: `${after()} ${pa(adjusted)}; at most ${PRESSURE_RANGE_PA.max} Pa is accepted.` })
    }
    const earlier = seen.get(p)
    if (earlier !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['readings', i, 'pressure'],
        message: `Pressure ${pa(p)} is already used by reading ${earlier + 1}; each reading needs a different pressure.`,
      })
    } else {
      seen.set(p, i)
    }
  })
}

/** A test direction with its reading checks applied. */
export const testSchema = testShape.superRefine(checkTestReadings)

/** The request object without top-level refinements: safe to `.extend()`. */
export const calculationShape = strict({
  units: unitSystemSchema,
  building: buildingShape,
  test: testSchema,
  reverse: testSchema.optional(),
})

type CalculationFields = z.output<typeof calculationShape>

function checkTemperatures(test: TestFields, units: 'ip' | 'si', key: 'test' | 'reverse', ctx: IssueSink): void {
  const { min: lo, max: hi } = units === 'ip' ? TEMPERATURE_RANGE_F : TEMPERATURE_RANGE_C
  const unit = units === 'ip' ? '°F' : '°C'
  for (const field of ['insideTemperature', 'outsideTemperature'] as const) {
    const value = test[field]
    if (value !== undefined && (value < lo || value > hi)) {
      ctx.addIssue({
        code: 'custom',
        path: [key, field],
        message: `${field === 'insideTemperature' ? 'Inside' : 'Outside'} temperature ${value} ${unit} is outside the plausible range ${lo} to ${hi} ${unit}.`,
      })
    }
  }
}

/** Cross-field checks of a whole request: temperature ranges in the request's unit, and a reverse test in the other direction. */
export function checkCalculation(value: CalculationFields, ctx: IssueSink): void {
  checkTemperatures(value.test, value.units, 'test', ctx)
  const reverse = value.reverse
  if (reverse !== undefined) {
    checkTemperatures(reverse, value.units, 'reverse', ctx)
    if (reverse.direction === value.test.direction) {
      ctx.addIssue({
        code: 'custom',
        path: ['reverse', 'direction'],
        message: `The reverse test must run in the other direction than the main test (both are ${reverse.direction}).`,
      })
    }
  }
}

/**
 * Applies {@link checkCalculation} to `calculationShape` or any `.extend()`ed copy of it.
 * Returns the same schema type, refined.
 */
export function withCalculationChecks<T extends z.ZodType<CalculationFields>>(schema: T): T {
  return schema.superRefine((value, ctx) => checkCalculation(value, ctx))
}

/** The calculation request body, fully checked. */
export const CalculationRequest = withCalculationChecks(calculationShape)
/** A validated calculation request (parsed output). */
export type CalculationRequest = z.output<typeof CalculationRequest>
/** What a client may send (parsed input; same shape, no defaults are applied). */
export type CalculationRequestInput = z.input<typeof CalculationRequest>

// Compile-time guarantee that a parsed request can go straight into analyzeLeakage().
const parsedFitsEngine = (value: CalculationRequest): LeakageInput => value
void parsedFitsEngine
