import { z } from 'zod'

const Params = z.object({ code: z.string().regex(/^\d{5}$/, 'must be 5 digits') })

// The self-check form's county suggestion: a postal code's state, city and counties.
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { code } = paramsAs(event, Params)
  const place = await postalPlace(code)
  if (!place) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `No place is known for postal code ${code}.` })
  return place
})
