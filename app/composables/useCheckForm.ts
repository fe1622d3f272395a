import type { CheckResponse } from '#shared/checks'

export interface CountyChoice { fips: string, name: string, weight: number | null }

/** The self-check form: the calculator's fields plus address, permit date and building type. */
export function useCheckForm() {
  const leakage = useLeakageForm()
  const where = reactive({
    line1: '',
    city: '',
    state: '',
    postalCode: '',
    countyFips: '',
    permitDate: '',
    buildingType: 'detached' as 'detached' | 'attached',
  })
  const safety = ref<string[]>([])
  const countyChoices = ref<CountyChoice[]>([])
  /** When two jurisdictions cover the county (a city inside a county), the user names one. */
  const jurisdictionChoices = ref<{ id: number, name: string }[]>([])
  const jurisdictionId = ref<number | null>(null)
  const countyNote = ref('')
  const response = ref<CheckResponse | null>(null)
  const problem = ref('')
  const problemField = ref<string>()
  const busy = ref(false)

  const body = computed(() => ({
    ...leakage.request.value,
    address: {
      line1: where.line1,
      city: where.city,
      state: where.state,
      postalCode: where.postalCode,
      ...(where.countyFips ? { countyFips: where.countyFips } : {}),
    },
    permitDate: where.permitDate,
    buildingType: where.buildingType,
    ...(jurisdictionId.value !== null ? { jurisdictionId: jurisdictionId.value } : {}),
  }))

  // A choice of jurisdiction belongs to one county: another county (or state) asks again.
  // Synchronous, so a form that fills in a saved address and then its jurisdiction keeps both.
  watch(() => [where.state, where.countyFips], () => {
    jurisdictionChoices.value = []
    jurisdictionId.value = null
  }, { flush: 'sync' })

  /**
   * A 422 asks the user to choose: the jurisdiction (two cover the county) or the county (the
   * postal code spans several). Offers the candidates it names; other errors are left alone.
   * `again` ends the county note ("then check again", "then save again").
   */
  function offerChoices(e: unknown, again: string) {
    const data = (e as { data?: { data?: { field?: string, candidates?: unknown[] } } }).data?.data
    if (data?.field === 'jurisdictionId' && data.candidates?.length) {
      jurisdictionChoices.value = data.candidates as { id: number, name: string }[]
    }
    else if (data?.candidates?.length) {
      countyChoices.value = data.candidates as CountyChoice[]
      countyNote.value = `Postal code ${where.postalCode} spans ${data.candidates.length} counties: choose the one the house is in, then ${again}.`
    }
  }

  /** Suggests the county for a postal code; several counties → the user chooses. */
  async function suggestCounty() {
    countyChoices.value = []
    countyNote.value = ''
    if (!/^\d{5}$/.test(where.postalCode.trim())) return
    try {
      const place = await $fetch<{ state: string, city: string, counties: CountyChoice[] }>(`/api/places/postal-codes/${where.postalCode.trim()}`)
      if (!where.state) where.state = place.state
      if (!where.city) where.city = place.city
      if (place.counties.length === 1) {
        where.countyFips = place.counties[0]!.fips
        countyNote.value = `${place.counties[0]!.name} County (${place.counties[0]!.fips}) — from the postal code. Change it if the address lies elsewhere.`
      }
      else {
        countyChoices.value = place.counties
        where.countyFips = ''
        countyNote.value = `Postal code ${where.postalCode} spans ${place.counties.length} counties: choose the one the house is in.`
      }
    }
    catch (e) {
      countyNote.value = errorMessage(e, 'No county is known for this postal code; enter the county FIPS code.')
    }
  }

  async function submit() {
    problem.value = ''
    problemField.value = undefined
    busy.value = true
    try {
      response.value = await $fetch<CheckResponse>('/api/checks', { method: 'POST', body: body.value })
    }
    catch (e) {
      response.value = null
      offerChoices(e, 'check again')
      problem.value = errorMessage(e)
      problemField.value = errorField(e)
    }
    finally {
      busy.value = false
    }
  }

  return { ...leakage, where, safety, countyChoices, jurisdictionChoices, jurisdictionId, countyNote, response, problem, problemField, busy, body, suggestCounty, offerChoices, submit }
}
