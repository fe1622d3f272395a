import { CalculationRequest, analyzeLeakage } from '#shared/leakage'

// Any signed-in user: the server recomputes from the readings with the same engine the page uses.
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const input = await readBodyAs(event, CalculationRequest)
  return analyzeLeakage(input)
})
