/** The verification page's report on a dossier PDF. */
export interface Verification {
  sealValid: boolean
  keyFingerprint: string | null
  items: { name: string, ok: boolean }[]
  message: string
  /** The standard PDF signature over the whole file: whether it holds, by a certificate of this installation. */
  pdfSignature: { valid: boolean, problem: string | null, subject: string | null } | null
  dossier?: {
    id: number
    attemptId: number
    version: number
    machineName: string
    teamName: string
    distanceLabel: string
    eventName: string
  } | null
  /** What became of the dossier, when this server issued it. */
  standing: {
    state: 'current' | 'superseded' | 'ratified' | 'refused' | 'withdrawn' | 'revoked'
    latestVersion: number
    words: string
  } | null
}
