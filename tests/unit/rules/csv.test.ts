import { existsSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import {
  LIMITS_HEADER, LIMITS_TEMPLATE, ZONE_MAP_TEMPLATE, detectDelimiter, detectZoneColumns, limitsToCsv, mapLimitRecords,
  mapZoneRecords, neutraliseCell, parseLimitNumber, readCsv, tableFromRows, unneutraliseCell, zoneMapToCsv, type RuleRow,
} from '#shared/rules'

const REFERENCE = resolve(import.meta.dirname, '../../../../shared/reference')

describe('CSV injection (OWASP "CSV Injection": prefix cells starting with = + - @ tab CR)', () => {
  it.each([
    ['=SUM(A1)', '\'=SUM(A1)'], ['+1', '\'+1'], ['-1', '\'-1'], ['@cmd', '\'@cmd'], ['\tx', '\'\tx'], ['\rx', '\'\rx'],
    ['Kitsap', 'Kitsap'], ['', ''], ['\'quoted', '\'quoted'], ['a=b', 'a=b'],
  ])('%j → %j and back', (cell, out) => {
    expect(neutraliseCell(cell)).toBe(out)
    expect(unneutraliseCell(neutraliseCell(cell))).toBe(cell)
  })
  it('an apostrophe before a safe character is kept', () => {
    expect(unneutraliseCell('\'Manu\'a')).toBe('\'Manu\'a')
  })
})

describe('reading CSV', () => {
  it('finds the delimiter from the header line', () => {
    expect(detectDelimiter('a,b,c\n1,2,3')).toBe(',')
    expect(detectDelimiter('a;b;c\n"1,5";2;3')).toBe(';')
    expect(detectDelimiter('a\tb\n1\t2')).toBe('\t')
    expect(detectDelimiter('"a,b";c\n')).toBe(';')
    expect(detectDelimiter('single\n1')).toBe(',')
  })

  it('keeps file line numbers through blank lines, CRLF and quoted newlines; drops a byte-order mark', () => {
    const t = readCsv('\uFEFFa,b\r\n\r\n1,"two\r\nlines"\r\n3,4\r\n\r\n')
    expect(t.header).toEqual(['a', 'b'])
    expect(t.records).toEqual([{ line: 3, cells: ['1', 'two\r\nlines'] }, { line: 5, cells: ['3', '4'] }])
    expect(t.problems).toEqual([])
  })

  it('a row with too many or too few fields is a problem on its line', () => {
    const t = readCsv('a,b\n1,2,3\n4\n5,6\n')
    expect(t.problems).toEqual([
      { line: 2, column: '(row)', reason: 'has 3 fields; the header has 2 (an unquoted comma, or a decimal comma?)' },
      { line: 3, column: '(row)', reason: 'has 1 field; the header has 2' },
    ])
    expect(t.records).toEqual([{ line: 4, cells: ['5', '6'] }])
  })

  it('header problems: empty and repeated column names, an empty file', () => {
    expect(readCsv('a,,a\n1,2,3').problems.map(p => p.reason)).toEqual(['the header has an empty column name', 'the header names this column twice'])
    expect(readCsv('').problems).toEqual([{ line: 1, column: '(file)', reason: 'the file is empty; the first line must name the columns' }])
  })

  it('tableFromRows (used on chunks parsed in the browser) strips the BOM from the first cell', () => {
    expect(tableFromRows([['\uFEFFcounty_fips', 'zone'], ['53035', '5C']]).header).toEqual(['county_fips', 'zone'])
  })
})

describe('zone-map columns', () => {
  it.each([
    [['county_fips', 'zone', 'county_name', 'state'], { fips: 'county_fips', zone: 'zone', countyName: 'county_name', state: 'state' }, []],
    [['county_fips', 'iecc_zone'], { fips: 'county_fips', zone: 'iecc_zone' }, []],
    [['State', 'State FIPS', 'County FIPS', 'IECC Climate Zone', 'IECC Moisture Regime', 'BA Climate Zone', 'County Name'],
      { stateFips: 'State FIPS', countyFips: 'County FIPS', zone: 'IECC Climate Zone', moisture: 'IECC Moisture Regime', countyName: 'County Name', state: 'State' }, ['BA Climate Zone']],
    [['GEOID', 'Climate Zone', 'Notes'], { fips: 'GEOID', zone: 'Climate Zone' }, ['Notes']],
  ])('guesses %j', (header, columns, ignored) => {
    expect(detectZoneColumns(header)).toEqual({ columns, ignored })
  })

  it('maps rows, derives the state from the FIPS, and reports each bad cell', () => {
    const t = readCsv('county_fips,zone,county_name,state\n53035,5c,Kitsap,\n8031,5B,Denver,CO\n53033,9,King,WA\n41001,4C,Baker,WA\n')
    const m = mapZoneRecords(t, detectZoneColumns(t.header).columns)
    expect(m.rows).toEqual([
      { line: 2, countyFips: '53035', zone: '5C', countyName: 'Kitsap', stateCode: 'WA' },
      { line: 3, countyFips: '08031', zone: '5B', countyName: 'Denver', stateCode: 'CO' },
    ])
    expect(m.warnings).toEqual([{ line: 3, column: 'county_fips', reason: '"8031" lost its leading zero; read as 08031' }])
    expect(m.problems).toEqual([
      { line: 4, column: 'zone', reason: '"9" is not a climate zone; zones run from 0 to 8' },
      { line: 5, column: 'state', reason: 'WA does not match the FIPS state code 41 (OR)' },
    ])
  })

  it('export writes county_fips, zone, county_name, state with leading zeros and CRLF', () => {
    expect(zoneMapToCsv([{ countyFips: '08031', zone: '5B', countyName: 'Denver', stateCode: 'CO' }, { countyFips: '02090', zone: '8', countyName: null, stateCode: 'AK' }]))
      .toBe('county_fips,zone,county_name,state\r\n08031,5B,Denver,CO\r\n02090,8,,AK\r\n')
  })

  it('the downloadable template imports cleanly', () => {
    const t = readCsv(ZONE_MAP_TEMPLATE)
    expect(mapZoneRecords(t, detectZoneColumns(t.header).columns)).toMatchObject({ problems: [], warnings: [] })
  })

  it.skipIf(!existsSync(REFERENCE))('both reference county files map without a problem (open data; README of ../shared/reference)', () => {
    for (const [file, count] of [['county-zones-iecc2021.csv', 3235], ['county-zones-pre2021.csv', 3237]] as const) {
      const t = readCsv(readFileSync(resolve(REFERENCE, file), 'utf8'))
      const m = mapZoneRecords(t, detectZoneColumns(t.header).columns)
      expect(m.problems, file).toEqual([])
      expect(m.rows, file).toHaveLength(count)
    }
  })
})

describe('limits CSV', () => {
  const rule: RuleRow = {
    key: 'r1', zones: '3-8', buildingType: 'any', kind: 'limit', logic: { '<=': [{ var: 'ach50' }, 3] },
    summary: 'Not exceeding 3 ACH50, tested "at 50 Pa", i.e. 0.2 in. w.g.', citationCode: 'IECC', citationEdition: '2015', citationSection: 'R402.4.1.2', notes: '',
  }
  const compound: RuleRow = { ...rule, key: 'alt', zones: 'all', logic: { or: [{ '<=': [{ var: 'ach50' }, 3] }, { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.28] }] }, summary: '=cmd|"/c calc"!A1', notes: 'line one\nline two' }

  it('export → import is lossless, including formula-looking text, quotes, commas and newlines', () => {
    const csv = limitsToCsv([rule, compound])
    expect(csv.split('\r\n')[0]).toBe(LIMITS_HEADER.join(','))
    expect(csv).toContain('r1,3-8,any,limit,ach50,<=,3,')
    expect(csv).toContain(`"'=cmd|""/c calc""!A1"`)
    const back = mapLimitRecords(readCsv(csv))
    expect(back.problems).toEqual([])
    expect(back.rows.map(r => r.rule)).toEqual([rule, compound])
  })

  it.each([
    ['0.28', 0.28], ['3', 3], ['.5', 0.5], ['1e3', 1000], [' 2.5 ', 2.5],
  ])('limit %j is %s', (raw, value) => {
    expect(parseLimitNumber(raw)).toEqual({ ok: true, value })
  })
  it.each([['0,28', /use a point for decimals/], ['3 ACH', /is not a number/], ['', /is empty/], ['Infinity', /is not a number/]])('limit %j is refused', (raw, reason) => {
    const r = parseLimitNumber(raw)
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.reason).toMatch(reason)
  })

  it('metric, comparison and limit write the json-logic; empty key, building type and kind take defaults', () => {
    const m = mapLimitRecords(readCsv('zones,metric,comparison,limit,citation_code,citation_edition,citation_section\n1-2,ach50,≤,5,IECC,2015,R402.4.1.2\n'))
    expect(m.problems).toEqual([])
    expect(m.rows[0]!.rule).toEqual({ key: 'r1', zones: '1-2', buildingType: 'any', kind: 'limit', logic: { '<=': [{ var: 'ach50' }, 5] }, summary: '', citationCode: 'IECC', citationEdition: '2015', citationSection: 'R402.4.1.2', notes: '' })
    expect(m.warnings).toEqual([{ line: 2, column: 'key', reason: 'was empty; the rule is keyed r1' }])
  })

  it('a bad logic cell names the place inside the rule', () => {
    const m = mapLimitRecords(readCsv('zones,logic,citation_code,citation_edition,citation_section\nall,"{""and"":[{""<="":[{""var"":""ach50""},3]},{""map"":[1,2]}]}",IECC,2015,R1\n'))
    expect(m.problems).toEqual([{ line: 2, column: 'logic', reason: 'and[1].map: operator "map" is not allowed; use == != === !== < <= > >= and or ! !! if + - * / min max var in' }])
  })

  it('the downloadable template imports cleanly', () => {
    expect(mapLimitRecords(readCsv(LIMITS_TEMPLATE)).problems).toEqual([])
  })
})
