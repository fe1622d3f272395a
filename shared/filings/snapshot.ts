/**
 * What a filing freezes at each submission (a revision): the project and test as filed and the
 * files attached. The reviewer's recomputation reads only this, so a later edit can never change
 * what was filed; the next submission makes a new revision, and `diffSnapshots` says what changed.
 */
import type { Reading, UnitSystem } from '../leakage/types'
import type { BuildingType } from '../rules/variables'
import type { TestStage, UploadKind, WindCondition } from './constants'

export interface ProjectSnapshot {
  addressLine: string
  city: string
  stateCode: string
  postalCode: string
  countyFips: string
  jurisdictionId: number | null
  permitNumber: string
  permitDate: string
  builderCompany: string
  builderContact: string
  buildingType: BuildingType
  units: UnitSystem
  volume: number
  floorArea: number | null
  enclosureArea: number | null
  height: number | null
  notes: string
}

export interface TestSnapshot {
  testedOn: string
  stage: TestStage
  tester: string
  equipment: string
  wind: WindCondition
  insideTemperature: number | null
  outsideTemperature: number | null
  direction: 'depressurization' | 'pressurization'
  baselineBefore: number | null
  baselineAfter: number | null
  readings: Reading[]
  assumedExponent: number | null
  safety: string[]
  statedCfm50: number | null
  statedAch50: number | null
  notes: string
}

export interface FileSnapshot { id: number, name: string, kind: UploadKind, size: number, sha256: string }

export interface FilingSnapshot {
  project: ProjectSnapshot
  test: TestSnapshot
  files: FileSnapshot[]
  /** The rater's note with this submission. */
  note: string
}

/** The body of a check (POST /api/checks shape) for a project and test, before validation. */
export function checkRequestOf(project: ProjectSnapshot, test: TestSnapshot) {
  const optional = <K extends string>(key: K, value: number | null) => (value === null ? {} : { [key]: value } as Record<K, number>)
  const baseline = test.baselineBefore === null && test.baselineAfter === null
    ? {}
    : { baseline: { ...optional('before', test.baselineBefore), ...optional('after', test.baselineAfter) } }
  return {
    units: project.units,
    building: {
      volume: project.volume,
      ...optional('floorArea', project.floorArea),
      ...optional('enclosureArea', project.enclosureArea),
      ...optional('height', project.height),
    },
    test: {
      direction: test.direction,
      ...baseline,
      readings: test.readings.map(r => ({ pressure: r.pressure, flow: r.flow })),
      ...optional('insideTemperature', test.insideTemperature),
      ...optional('outsideTemperature', test.outsideTemperature),
      ...(test.readings.length === 1 ? optional('assumedExponent', test.assumedExponent) : {}),
    },
    address: { line1: project.addressLine, city: project.city, state: project.stateCode, postalCode: project.postalCode, countyFips: project.countyFips },
    permitDate: project.permitDate,
    buildingType: project.buildingType,
    ...(project.jurisdictionId === null ? {} : { jurisdictionId: project.jurisdictionId }),
  }
}

export interface SnapshotChange { field: string, label: string, before: string, after: string }

const LABELS: Record<string, string> = {
  'project.addressLine': 'Street address', 'project.city': 'City', 'project.stateCode': 'State', 'project.postalCode': 'Postal code',
  'project.countyFips': 'County FIPS', 'project.jurisdictionId': 'Jurisdiction', 'project.permitNumber': 'Permit number',
  'project.permitDate': 'Permit date', 'project.builderCompany': 'Builder', 'project.builderContact': 'Builder contact',
  'project.buildingType': 'Building type', 'project.units': 'Units', 'project.volume': 'Volume', 'project.floorArea': 'Floor area',
  'project.enclosureArea': 'Enclosure area', 'project.height': 'Height', 'project.notes': 'Project notes',
  'test.testedOn': 'Test date', 'test.stage': 'Stage', 'test.tester': 'Tester', 'test.equipment': 'Equipment', 'test.wind': 'Wind',
  'test.insideTemperature': 'Inside temperature', 'test.outsideTemperature': 'Outside temperature', 'test.direction': 'Direction',
  'test.baselineBefore': 'Baseline before', 'test.baselineAfter': 'Baseline after', 'test.readings': 'Readings',
  'test.assumedExponent': 'Assumed exponent', 'test.safety': 'Safety checklist', 'test.statedCfm50': 'Stated CFM50',
  'test.statedAch50': 'Stated ACH50', 'test.notes': 'Test notes', 'files': 'Files', 'note': 'Note with the filing',
}

function show(value: unknown): string {
  if (value === null || value === undefined || value === '') return '—'
  if (Array.isArray(value)) {
    if (value.length === 0) return '—'
    return value.map(v => (typeof v === 'object' && v !== null && 'pressure' in v && 'flow' in v)
      ? `${(v as Reading).pressure} Pa → ${(v as Reading).flow}`
      : (typeof v === 'object' && v !== null && 'name' in v) ? `${(v as FileSnapshot).name} (${(v as FileSnapshot).sha256.slice(0, 8)})` : String(v)).join('; ')
  }
  return String(value)
}

/** The fields that differ between two revisions, in form order, with before/after in words. */
export function diffSnapshots(before: FilingSnapshot, after: FilingSnapshot): SnapshotChange[] {
  const changes: SnapshotChange[] = []
  const compare = (field: string, a: unknown, b: unknown) => {
    const sa = show(a)
    const sb = show(b)
    if (sa !== sb) changes.push({ field, label: LABELS[field] ?? field, before: sa, after: sb })
  }
  for (const key of Object.keys(after.project) as (keyof ProjectSnapshot)[]) compare(`project.${key}`, before.project[key], after.project[key])
  for (const key of Object.keys(after.test) as (keyof TestSnapshot)[]) {
    const a = key === 'safety' ? [...before.test.safety].sort() : before.test[key]
    const b = key === 'safety' ? [...after.test.safety].sort() : after.test[key]
    compare(`test.${key}`, a, b)
  }
  compare('files', before.files, after.files)
  compare('note', before.note, after.note)
  return changes
}

export interface StatedComparison {
  metric: 'cfm50' | 'ach50'
  stated: number | null
  recomputed: number
  /** (stated − recomputed) / recomputed × 100; null without a stated value. */
  differencePercent: number | null
  /** True when the stated value is off by more than the tolerance. */
  differs: boolean
}

/**
 * Stated values differ when off by more than 1 % of the recomputation — about the rounding a
 * gauge report applies to a 3–4 significant-figure result (common practice, our tolerance).
 */
export const STATED_TOLERANCE_PERCENT = 1

export function compareStated(stated: { cfm50: number | null, ach50: number | null }, recomputed: { cfm50: number, ach50: number }): StatedComparison[] {
  return (['cfm50', 'ach50'] as const).map((metric) => {
    const s = stated[metric]
    const r = recomputed[metric]
    const differencePercent = s === null ? null : ((s - r) / r) * 100
    return { metric, stated: s, recomputed: r, differencePercent, differs: differencePercent !== null && Math.abs(differencePercent) > STATED_TOLERANCE_PERCENT }
  })
}
