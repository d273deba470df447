/** One field of a set-up form: its key in the body, its label, and a type or a list of options. */
export interface SetupField {
  key: string
  label: string
  type?: 'text' | 'date' | 'number'
  options?: { value: string | number, label: string }[]
  hint?: string
}
