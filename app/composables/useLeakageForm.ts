import { CalculationRequest, analyzeLeakage, type LeakageResult, type TestDirection, type UnitSystem } from '#shared/leakage'

export interface ReadingRow { pressure: string, flow: string }

/** What the rater types, as text so half-typed numbers survive; converted on every change. */
export interface LeakageFormState {
  building: { volume: string, floorArea: string, enclosureArea: string, height: string }
  test: {
    direction: TestDirection
    baselineBefore: string
    baselineAfter: string
    readings: ReadingRow[]
    insideTemperature: string
    outsideTemperature: string
    assumedExponent: string
  }
}

export function emptyLeakageForm(): LeakageFormState {
  return {
    building: { volume: '', floorArea: '', enclosureArea: '', height: '' },
    test: {
      direction: 'depressurization',
      baselineBefore: '',
      baselineAfter: '',
      readings: [{ pressure: '', flow: '' }],
      insideTemperature: '',
      outsideTemperature: '',
      assumedExponent: '0.65',
    },
  }
}

/** '' → undefined (optional field left blank); anything else → a number, NaN when it is not one. */
export function toNumber(text: string): number | undefined {
  const trimmed = text.trim()
  if (trimmed === '') return undefined
  return Number(trimmed)
}

function dropUndefined<T extends Record<string, unknown>>(obj: T): Partial<T> {
  return Object.fromEntries(Object.entries(obj).filter(([, v]) => v !== undefined)) as Partial<T>
}

/** The request body of POST /api/calculations for this form. Blank reading rows are left out. */
export function leakageRequest(state: LeakageFormState, units: UnitSystem) {
  const t = state.test
  const before = toNumber(t.baselineBefore)
  const after = toNumber(t.baselineAfter)
  const readings = t.readings
    .filter(r => r.pressure.trim() !== '' || r.flow.trim() !== '')
    .map(r => ({ pressure: toNumber(r.pressure) ?? Number.NaN, flow: toNumber(r.flow) ?? Number.NaN }))
  return {
    units,
    building: dropUndefined({
      volume: toNumber(state.building.volume),
      floorArea: toNumber(state.building.floorArea),
      enclosureArea: toNumber(state.building.enclosureArea),
      height: toNumber(state.building.height),
    }),
    test: dropUndefined({
      direction: t.direction,
      baseline: before === undefined && after === undefined ? undefined : dropUndefined({ before, after }),
      readings,
      insideTemperature: toNumber(t.insideTemperature),
      outsideTemperature: toNumber(t.outsideTemperature),
      assumedExponent: readings.length === 1 ? toNumber(t.assumedExponent) : undefined,
    }),
  }
}

/**
 * A live calculation: the same shared schema and engine as the server, run as the user types.
 * `errors` maps a field path ("building.volume", "test.readings.0.pressure") to its reason.
 */
export function useLeakageForm(initial: LeakageFormState = emptyLeakageForm()) {
  const state = reactive(initial) as LeakageFormState
  const preferences = usePreferences()

  const request = computed(() => leakageRequest(state, preferences.units))
  const parsed = computed(() => CalculationRequest.safeParse(request.value))
  const errors = computed<Record<string, string>>(() => {
    if (parsed.value.success) return {}
    const out: Record<string, string> = {}
    for (const issue of parsed.value.error.issues) {
      const key = issue.path.map(String).join('.')
      out[key] ??= issue.message
    }
    return out
  })
  const result = computed<LeakageResult | null>(() => (parsed.value.success ? analyzeLeakage(parsed.value.data) : null))
  /** True once the minimum to compute is there: a volume and one complete reading. */
  const started = computed(() => state.building.volume.trim() !== '' && state.test.readings.some(r => r.pressure.trim() !== '' && r.flow.trim() !== ''))

  return { state, request, errors, result, started }
}
