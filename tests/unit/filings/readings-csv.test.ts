import { describe, expect, it } from 'vitest'
import { cellNumber, detectDelimiter, mapReadings, readCsvTable, suggestMapping } from '#shared/filings'

const dep = { direction: 'depressurization' as const }

describe('readings file → readings (all or nothing)', () => {
  it('reads a gauge export: header, BOM, CRLF, a blank line, quoted commas', () => {
    const table = readCsvTable('\uFEFFTime,Pressure (Pa),Flow (cfm),Note\r\n10:01,-50,1020,"calm, sunny"\r\n\r\n10:02,-40,880,\r\n')
    expect(table.delimiter).toBe(',')
    expect(table.rows.map(r => r.line)).toEqual([1, 2, 4])
    const mapping = suggestMapping(table)
    expect(mapping).toEqual({ pressureColumn: 1, flowColumn: 2, hasHeader: true, flipSign: false })
    expect(mapReadings(table, mapping, dep)).toEqual({ readings: [{ line: 2, pressure: -50, flow: 1020 }, { line: 4, pressure: -40, flow: 880 }], problems: [] })
  })

  it('detects semicolons and tabs from the first line', () => {
    expect(detectDelimiter('a;b;c\n1;2;3')).toBe(';')
    expect(detectDelimiter('a\tb\n1\t2')).toBe('\t')
    expect(detectDelimiter('"x;y",b\n')).toBe(',')
  })

  it('without a header: columns 1 and 2', () => {
    const table = readCsvTable('-50,1020\n-25,650\n')
    expect(suggestMapping(table)).toEqual({ pressureColumn: 0, flowColumn: 1, hasHeader: false, flipSign: false })
  })

  it('lists every bad row with its line and takes nothing', () => {
    const table = readCsvTable('P,Q\n-50,1020\nx,900\n-30,"3,5"\n-20,-4\n-10\n')
    const mapped = mapReadings(table, { pressureColumn: 0, flowColumn: 1, hasHeader: true, flipSign: false }, dep)
    expect(mapped.readings).toEqual([])
    expect(mapped.problems).toEqual([
      { line: 3, column: 'P (column 1)', reason: '"x" is not a number' },
      { line: 4, column: 'Q (column 2)', reason: '"3,5" uses a decimal comma; write it with a point (3.5)' },
      { line: 5, column: 'Q (column 2)', reason: 'flow must be greater than zero' },
      { line: 6, column: 'Q (column 2)', reason: 'is empty' },
    ])
  })

  it('applies the test\'s own reading rules (sign, range, repeats) with the file\'s line numbers', () => {
    const table = readCsvTable('P,Q\n50,1020\n-50,1000\n-50,990\n')
    const mapped = mapReadings(table, { pressureColumn: 0, flowColumn: 1, hasHeader: true, flipSign: false }, dep)
    expect(mapped.problems.map(p => p.line)).toEqual([2, 4])
    expect(mapped.problems[0]!.reason).toContain('readings must be negative')
    expect(mapped.problems[1]!.reason).toContain('already used by reading 2')
  })

  it('flips positive depressurization magnitudes when asked', () => {
    const table = readCsvTable('50,1020\n25,650\n')
    expect(mapReadings(table, { pressureColumn: 0, flowColumn: 1, hasHeader: false, flipSign: true }, dep).readings.map(r => r.pressure)).toEqual([-50, -25])
  })

  it('refuses a column that does not exist or the same column twice', () => {
    const table = readCsvTable('1,2\n')
    expect(mapReadings(table, { pressureColumn: 0, flowColumn: 5, hasHeader: false, flipSign: false }, dep).problems[0]).toEqual({ line: 0, column: 'flowColumn', reason: 'column 6 does not exist (the file has 2)' })
    expect(mapReadings(table, { pressureColumn: 0, flowColumn: 0, hasHeader: false, flipSign: false }, dep).problems[0]!.reason).toBe('pressure and flow must be different columns')
  })

  it('more than 50 readings are refused (MAX_READINGS)', () => {
    const rows = Array.from({ length: 51 }, (_, i) => `${-(i + 10) / 1},${500 + i}`).join('\n')
    const mapped = mapReadings(readCsvTable(rows), { pressureColumn: 0, flowColumn: 1, hasHeader: false, flipSign: false }, dep)
    expect(mapped.problems).toContainEqual({ line: 51, column: '(file)', reason: 'at most 50 readings are accepted; the file has 51' })
  })

  it.each([['1.5', 1.5], ['-2e1', -20], ['.5', 0.5], ['', 'is empty'], ['1,5', '"1,5" uses a decimal comma; write it with a point (1.5)'], ['12 Pa', '"12 Pa" is not a number']])('cellNumber(%j)', (cell, expected) => {
    expect(cellNumber(cell)).toEqual(expected)
  })
})
