// The mutation scores per area, from Stryker's JSON report, with the mutants listed as equivalent (they cannot
// change a result; each with why) taken out. Exits 1 when an area is under its goal.
// Usage: node scripts/mutation-score.mjs reports/mutation/mutation.json tests/unit/equivalent-mutants.md
import { readFileSync } from 'node:fs'

const [reportPath, equivalentsPath] = process.argv.slice(2)
const report = JSON.parse(readFileSync(reportPath, 'utf8'))
const GOAL = 90
const AREAS = [
  ['shared/rules (the rules engine and the planner)', p => p.startsWith('shared/rules/')],
  ['shared/inspection (checklists)', p => p.startsWith('shared/inspection/')],
  ['shared/utils/money.ts', p => p === 'shared/utils/money.ts'],
]
const squash = s => s.replace(/\s+/g, ' ').trim()

/** Rows of the equivalents' table: | file | mutator | original | replacement | why | */
const equivalents = readFileSync(equivalentsPath, 'utf8').split('\n')
  .filter(l => /^\|\s*shared\//.test(l))
  .map((l) => {
    const cells = l.split(/(?<!\\)\|/).slice(1, -1).map(c => squash(c.replace(/\\\|/g, '|').replace(/^`|`$/g, '')))
    return { file: cells[0], mutator: cells[1], original: cells[2].replace(/^`|`$/g, ''), replacement: cells[3].replace(/^`|`$/g, ''), why: cells[4], used: 0 }
  })

function original(source, { start, end }) {
  const lines = source.split('\n')
  if (start.line === end.line) return lines[start.line - 1].slice(start.column - 1, end.column - 1)
  return [lines[start.line - 1].slice(start.column - 1), ...lines.slice(start.line, end.line - 1),
    lines[end.line - 1].slice(0, end.column - 1)].join('\n')
}

const tally = AREAS.map(([name]) => ({ name, killed: 0, survived: 0, equivalent: 0, files: new Map() }))
const survivors = []
for (const [path, file] of Object.entries(report.files)) {
  const rel = path.replace(/^.*?(shared\/)/, '$1')
  const at = AREAS.findIndex(([, match]) => match(rel))
  if (at < 0) continue
  const t = tally[at]
  for (const m of file.mutants) {
    if (['Ignored', 'CompileError', 'RuntimeError'].includes(m.status)) continue
    if (m.status === 'Killed' || m.status === 'Timeout') {
      t.killed++
      continue
    }
    const code = squash(original(file.source, m.location))
    const replacement = squash(m.replacement ?? '')
    const eq = equivalents.find(e => e.file === rel && e.mutator === m.mutatorName && e.original === code && e.replacement === replacement)
    if (eq) {
      eq.used++
      t.equivalent++
      continue
    }
    t.survived++
    t.files.set(rel, (t.files.get(rel) ?? 0) + 1)
    const cell = x => x.replace(/\|/g, '\\|')
    survivors.push(process.env.MUTATION_SURVIVORS === 'md'
      ? `| ${rel} | ${m.mutatorName} | \`${cell(code)}\` | \`${cell(replacement)}\` | (line ${m.location.start.line}) |`
      : `${rel}:${m.location.start.line}:${m.location.start.column} ${m.mutatorName} \`${code.slice(0, 80)}\` → \`${replacement.slice(0, 80)}\` (${m.status})`)
  }
}

if (process.env.MUTATION_SURVIVORS) console.log(survivors.join('\n'))
let failed = false
console.log('\nmutation score (killed ÷ mutants, equivalents out), goal ≥ 90 %, by the unit tests alone:')
for (const t of tally) {
  const total = t.killed + t.survived
  const score = total ? (100 * t.killed) / total : 100
  if (score < GOAL) failed = true
  console.log(`  ${score.toFixed(2).padStart(6)} %  ${t.name}: ${t.killed} killed, ${t.survived} survived, ${t.equivalent} equivalent`)
  const worst = [...t.files].sort((a, b) => b[1] - a[1]).slice(0, 5)
  if (worst.length) console.log(`           most survivors: ${worst.map(([f, n]) => `${f} ${n}`).join(', ')}`)
}
const stale = equivalents.filter(e => !e.used)
if (stale.length) console.log(`\n${stale.length} equivalent(s) listed that no surviving mutant matches (mended code?):\n${stale.map(e => `  ${e.file} ${e.mutator} ${e.original}`).join('\n')}`)
process.exit(failed ? 1 : 0)
