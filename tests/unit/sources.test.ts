import { describe, expect, it } from 'vitest'
import { profiles, PROFILE_IDS } from '#shared/rules/profiles'
import { ruleLabels, type Certainty, type Sourced } from '#shared/rules/profile'
import { checklistLibrary, CHECKLIST_IDS } from '#shared/inspection/templates'
import { allItems } from '#shared/inspection/evaluate'

// Every rule value and every checklist item carries where it comes from and how sure we are of it, printed beside
// it on the rules page and in the dossier (the project's rule: no value without its source). A source is a sentence
// or a document's name, never empty or a placeholder; the certainty is one of the five the project uses.
const CERTAINTIES: Certainty[] = ['seen', 'from memory', 'common practice', 'not settled', 'not known']
const sourceProblems = (where: string, s: { source: string, certainty: string }) => [
  ...(CERTAINTIES.includes(s.certainty as Certainty) ? [] : [`${where}: certainty "${s.certainty}"`]),
  // At least two words of letters: a document's name or a sentence.
  ...((/[a-z]{2,}\W+[a-z]{2,}/i.test(s.source) && s.source.trim() === s.source) ? [] : [`${where}: source "${s.source}"`]),
]

describe('sources and certainties', () => {
  it.each(PROFILE_IDS)('every rule value of the %s profile has its source', (id) => {
    const p = profiles[id]
    expect(p.id).toBe(id)
    const keys = Object.keys(ruleLabels) as (keyof typeof ruleLabels)[]
    const problems = keys.flatMap((k) => {
      const v = p[k] as Sourced<unknown> | undefined
      return v === undefined ? [`${id}.${k}: missing`] : sourceProblems(`${id}.${k}`, v)
    })
    expect(problems).toEqual([])
    // Every rule the page lists is present in the library's profiles (copies frozen earlier may lack some).
    expect(keys.filter(k => p[k] === undefined)).toEqual([])
  })

  it.each(CHECKLIST_IDS)('every item of the %s checklist has its source, a label and a unique key', (id) => {
    const t = checklistLibrary[id]
    const items = allItems(t)
    expect(items.length).toBeGreaterThan(10)
    expect(items.flatMap(i => sourceProblems(`${id}.${i.key}`, i))).toEqual([])
    expect(new Set(items.map(i => i.key)).size).toBe(items.length)
    expect(items.filter(i => !/^"?[A-Z]/.test(i.label)).map(i => i.key)).toEqual([])
  })
})
