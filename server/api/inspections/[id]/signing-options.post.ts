// A passkey signs the inspection as stored now: the challenge is the SHA-256 of its canonical content.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'inspection', ['scrutineer'])
  return signingOptions(user.id, passkeyDigest('inspection', await inspectionContent(recordId)))
})
