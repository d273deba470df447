import { calculate } from '#shared/rules/calculator'
import { calculatorRequestSchema } from '#shared/schemas/calculator'

// public route: the calculator needs no sign-in.
export default defineEventHandler(async (event) => {
  const request = await validBody(event, calculatorRequestSchema)
  return calculate(request)
})
