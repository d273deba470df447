import type { ItemResult } from '../constants'
import type { ItemVerdict } from '../inspection/evaluate'

/** A checklist item as answered: the result, the measured value as entered, and its verdict. */
export interface ItemAnswer {
  result: ItemResult
  value: string | null
  enteredAs: string | null
  note: string | null
  verdict: ItemVerdict
}
