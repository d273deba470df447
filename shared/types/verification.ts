/** The verification page's report on a dossier PDF. */
export interface Verification {
  sealValid: boolean
  keyFingerprint: string | null
  items: { name: string, ok: boolean }[]
  message: string
  dossier?: { id: number, attemptId: number, version: number } | null
}
