import { existsSync, readFileSync, readdirSync } from 'node:fs'
import { resolve } from 'node:path'
import Papa from 'papaparse'
import { describe, expect, it } from 'vitest'
import { evaluateRule, mapLimitRecords, readCsv, ruleTerms, zoneMatches, type RuleRow } from '#shared/rules'

const RULES = resolve(import.meta.dirname, '../../../rules')
const CODE_LIMITS = resolve(import.meta.dirname, '../../../../shared/reference/code-limits.csv')
const manifest = JSON.parse(readFileSync(resolve(RULES, 'index.json'), 'utf8')) as { tables: { file: string, code: string, edition: string }[] }
const load = (file: string): RuleRow[] => {
  const m = mapLimitRecords(readCsv(readFileSync(resolve(RULES, file), 'utf8')))
  expect(m.problems, file).toEqual([])
  return m.rows.map(r => r.rule)
}

describe('the model limit tables in rules/', () => {
  it('index.json lists every CSV in rules/ and nothing else', () => {
    expect(manifest.tables.map(t => t.file).sort()).toEqual(readdirSync(RULES).filter(f => f.endsWith('.csv')).sort())
  })

  it.each(manifest.tables.map(t => t.file))('%s parses, validates and cites code, edition and section on every row', (file) => {
    for (const rule of load(file)) {
      expect(rule.citationCode && rule.citationEdition && rule.citationSection, `${file} ${rule.key}`).toBeTruthy()
      expect(rule.notes).toMatch(/Reference status: READ/)
    }
  })

  type LimitRow = { program: string, edition: string, section: string, climate_zones: string, metric: string, limit: string, comparison: string, status: string }
  it.skipIf(!existsSync(CODE_LIMITS))('every shipped limit is a row of code-limits.csv marked READ or SECONDARY (not MEMORY), with its numbers', () => {
    const reference = Papa.parse<LimitRow>(readFileSync(CODE_LIMITS, 'utf8'), { header: true, skipEmptyLines: true }).data
    const usable = reference.filter(r => /^READ|^SECONDARY/.test(r.status) && !/MEMORY/.test(r.status))
    // Each shipped (edition, section, zones, limit, comparison) → one usable reference row.
    const checks: [string, string, string, string, number, string][] = [
      ['iecc-2009.csv', '2009', '402.4.2.1', 'all', 7, '<'],
      ['iecc-2012.csv', '2012', 'R402.4.1.2', '1-2', 5, '<='],
      ['iecc-2012.csv', '2012', 'R402.4.1.2', '3-8', 3, '<='],
      ['iecc-2015.csv', '2015', 'R402.4.1.2', '1-2', 5, '<='],
      ['iecc-2015.csv', '2015', 'R402.4.1.2', '3-8', 3, '<='],
      ['fbc-2017-energy.csv', '6th ed. (2017)', 'R402.4.1.2', '1-2', 7, '<='],
      ['phi-passive-house-classic.csv', 'Passive House classic', 'certification criterion', 'any', 0.6, '<='],
    ]
    for (const [file, edition, section, zones, limit, comparison] of checks) {
      const row = usable.find(r => r.edition === edition && r.section.startsWith(section) && r.climate_zones === zones)
      expect(row, `${file} ${edition} ${zones}`).toBeDefined()
      expect(Number(row!.limit)).toBe(limit)
      expect(row!.comparison).toBe(comparison)
      const shipped = load(file).filter(r => r.kind === 'limit' && (zones === 'any' || r.zones === zones))
      expect(shipped.map(r => ruleTerms(r.logic).terms[0]!.limit), file).toContain(limit)
    }
    // The IRC R303.4 advisory: "< 5" ACH50 [READ (secondary)].
    const irc = usable.find(r => r.program === 'IRC' && r.section.startsWith('R303.4'))!
    expect([irc.comparison, irc.limit.includes('< 5')]).toEqual(['<', true])
    // ZERH Rev 07 [READ]: "3 / 2.5 / 2 / 1.5 / 3" for zones "1-2 / 3-4 / 5-7 / 8 / attached".
    const zerh = usable.find(r => r.program === 'DOE Zero Energy Ready Home')!
    expect(zerh.limit).toBe('3 / 2.5 / 2 / 1.5 / 3')
    expect(load('doe-zerh-rev07.csv').map(r => [r.zones, r.buildingType, ruleTerms(r.logic).terms[0]!.limit])).toEqual([
      ['1-2', 'detached', 3], ['3-4', 'detached', 2.5], ['5-7', 'detached', 2], ['8', 'detached', 1.5], ['all', 'attached', 3],
    ])
    // Nothing from MEMORY rows ships: no 2018, 2021 or 2024 IECC tables.
    expect(manifest.tables.map(t => `${t.code} ${t.edition}`)).not.toEqual(expect.arrayContaining([expect.stringMatching(/2018|2021|2024/)]))
  })

  it('CHECKS.md §7 vectors through the shipped tables [COMPUTED; IECC 2015 R402.4.1.2 and IECC 2009 402.4.2.1]', () => {
    const volume = 18000
    const decide = (file: string, zone: string, cfm50: number) => {
      const rules = load(file).filter(r => r.kind === 'limit' && zoneMatches(r.zones, zone))
      expect(rules).toHaveLength(1)
      return evaluateRule(rules[0]!.logic, { ach50: cfm50 * 60 / volume })
    }
    expect(decide('iecc-2015.csv', '4C', 900)).toBe(true) // ACH50 3.000, "not exceeding 3.0"
    expect(decide('iecc-2015.csv', '4C', 901)).toBe(false) // 3.003
    expect(decide('iecc-2009.csv', '5B', 2100)).toBe(false) // 7.000 is not "less than 7"
    expect(decide('iecc-2015.csv', '2A', 1500)).toBe(true) // 5.000 meets "not exceeding 5" in zones 1-2
    // IRC R303.4: below 5 ACH50 the ventilation notice applies [SECONDARY].
    const advisory = load('iecc-2015.csv').find(r => r.kind === 'advisory')!
    expect(evaluateRule(advisory.logic, { ach50: 900 * 60 / volume })).toBe(true)
  })
})
