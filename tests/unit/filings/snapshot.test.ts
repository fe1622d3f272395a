import { describe, expect, it } from 'vitest'
import { CheckRequest } from '#shared/checks'
import { checkRequestOf, compareStated, diffSnapshots, type FilingSnapshot } from '#shared/filings'

const snapshot: FilingSnapshot = {
  project: {
    addressLine: '9 Wren Hollow', city: 'Juniper Flats', stateCode: 'CO', postalCode: '80202', countyFips: '08031', jurisdictionId: null,
    permitNumber: 'JF-1', permitDate: '2024-04-01', builderCompany: 'B', builderContact: 'C', buildingType: 'detached', units: 'ip',
    volume: 18000, floorArea: 2000, enclosureArea: null, height: null, notes: '',
  },
  test: {
    testedOn: '2024-09-10', stage: 'final', tester: 'T', equipment: 'E', wind: 'calm', insideTemperature: null, outsideTemperature: null,
    direction: 'depressurization', baselineBefore: null, baselineAfter: null, readings: [{ pressure: -50, flow: 900 }], assumedExponent: 0.65,
    safety: ['fire', 'combustion'], statedCfm50: 900, statedAch50: 3, notes: '',
  },
  files: [],
  note: '',
}

describe('a filing snapshot', () => {
  it('makes a valid check request (leaving out what is missing rather than sending null)', () => {
    const body = checkRequestOf(snapshot.project, snapshot.test)
    expect(body.building).toEqual({ volume: 18000, floorArea: 2000 })
    expect(body.test).toEqual({ direction: 'depressurization', readings: [{ pressure: -50, flow: 900 }], assumedExponent: 0.65 })
    expect(CheckRequest.safeParse(body).success).toBe(true)
  })

  it('lists what changed between revisions, ignoring the order of ticked safety items', () => {
    const next: FilingSnapshot = {
      ...snapshot,
      test: { ...snapshot.test, readings: [{ pressure: -50, flow: 850 }], statedCfm50: 850, safety: ['combustion', 'fire'] },
      files: [{ id: 1, name: 'a.png', kind: 'photo', size: 3, sha256: 'abcdef0123' }],
    }
    expect(diffSnapshots(snapshot, next)).toEqual([
      { field: 'test.readings', label: 'Readings', before: '-50 Pa → 900', after: '-50 Pa → 850' },
      { field: 'test.statedCfm50', label: 'Stated CFM50', before: '900', after: '850' },
      { field: 'files', label: 'Files', before: '—', after: 'a.png (abcdef01)' },
    ])
    expect(diffSnapshots(snapshot, snapshot)).toEqual([])
  })

  it('flags stated values more than 1 % off the recomputation', () => {
    const rows = compareStated({ cfm50: 905, ach50: null }, { cfm50: 900, ach50: 3 })
    expect(rows[0]).toMatchObject({ metric: 'cfm50', stated: 905, differs: false })
    expect(rows[0]!.differencePercent).toBeCloseTo(0.5556, 4) // (905 − 900)/900
    const off = compareStated({ cfm50: 910, ach50: 3 }, { cfm50: 900, ach50: 3 })[0]!
    expect(off.differs).toBe(true) // 1.11 % > 1 %
    expect(off.differencePercent).toBeCloseTo(1.111, 3)
    expect(rows[1]).toEqual({ metric: 'ach50', stated: null, recomputed: 3, differencePercent: null, differs: false })
  })
})
