// A passkey signs the inspection as stored now: the server issues a random,
// single-use challenge over the SHA-256 of that content, for this signer and this act.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'inspection', ['scrutineer'])
  return signingOptions(user.id, 'inspection', passkeyDigest('inspection', await inspectionContent(recordId)))
})
