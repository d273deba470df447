// The plans of the teams the signed-in person enters for.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  return plansOf(user.id)
})
