import type { ImportProblem, RuleRow, ZoneColumns } from '#shared/rules'

/**
 * Data and actions of the rule-table screens: jurisdictions, zone maps and limits tables.
 * Reads go through useFetch with explicit keys; actions use $fetch and then refresh the key.
 */

export interface ImportOutcome {
  rowsInFile: number
  added?: number
  changed?: number
  removed?: number
  unchanged?: number
  warnings: ImportProblem[]
  timingMs: number
}

export function useZoneMaps() {
  const { data, refresh, pending } = useFetch('/api/zone-maps', { key: 'zone-maps', default: () => [] })
  async function create(input: { name: string, edition: string, source: string }) {
    const row = await $fetch('/api/zone-maps', { method: 'POST', body: input })
    await refreshNuxtData('zone-maps')
    return row
  }
  return { zoneMaps: data, refresh, pending, create }
}

export function useZoneMap(id: Ref<number>) {
  const meta = useFetch(() => `/api/zone-maps/${id.value}`, { key: `zone-map:${id.value}` })
  const rows = useFetch(() => `/api/zone-maps/${id.value}/counties`, { key: `zone-map-rows:${id.value}`, server: false, lazy: true })
  async function refreshAll() {
    await Promise.all([meta.refresh(), rows.refresh()])
  }
  async function saveRow(fips: string, body: { zone: string, countyName?: string | null, stateCode?: string | null }) {
    const row = await $fetch(`/api/zone-maps/${id.value}/counties/${fips}`, { method: 'PUT', body })
    await meta.refresh()
    return row
  }
  async function deleteRow(fips: string) {
    await $fetch(`/api/zone-maps/${id.value}/counties/${fips}`, { method: 'DELETE' })
    await meta.refresh()
  }
  async function update(input: { name: string, edition: string, source: string }) {
    await $fetch(`/api/zone-maps/${id.value}`, { method: 'PATCH', body: input })
    await meta.refresh()
    await refreshNuxtData('zone-maps')
  }
  return { meta: meta.data, metaError: meta.error, rows: rows.data, rowsPending: rows.pending, refreshAll, saveRow, deleteRow, update }
}

export function useRuleSets() {
  const { data, refresh } = useFetch('/api/rule-sets', { key: 'rule-sets', default: () => [] })
  const { data: models } = useFetch('/api/rule-sets/models', { key: 'rule-set-models', default: () => [] })
  async function create(input: { name: string, code: string, edition: string, description: string }) {
    const row = await $fetch('/api/rule-sets', { method: 'POST', body: input })
    await refreshNuxtData('rule-sets')
    return row
  }
  async function createFromModel(file: string, name?: string) {
    const row = await $fetch('/api/rule-sets/from-model', { method: 'POST', body: name ? { file, name } : { file } })
    await refreshNuxtData('rule-sets')
    return row
  }
  return { ruleSets: data, models, refresh, create, createFromModel }
}

export function useRuleSet(id: Ref<number>) {
  const { data, refresh, error } = useFetch(() => `/api/rule-sets/${id.value}`, { key: `rule-set:${id.value}` })
  async function saveDraft(rules: RuleRow[], baseRevision: number) {
    const saved = await $fetch(`/api/rule-sets/${id.value}/draft`, { method: 'PUT', body: { rules, baseRevision } })
    await refresh()
    return saved
  }
  async function publish(note: string) {
    const version = await $fetch(`/api/rule-sets/${id.value}/publish`, { method: 'POST', body: { note } })
    await refresh()
    await refreshNuxtData('rule-sets')
    return version
  }
  async function discard() {
    await $fetch(`/api/rule-sets/${id.value}/discard-draft`, { method: 'POST' })
    await refresh()
  }
  async function diff(from: number | 'draft', to: number | 'draft') {
    return $fetch(`/api/rule-sets/${id.value}/diff`, { query: { from, to } })
  }
  return { ruleSet: data, error, refresh, saveDraft, publish, discard, diff }
}

export function useJurisdictions() {
  const { data, refresh } = useFetch('/api/jurisdictions', { key: 'jurisdictions', default: () => [] })
  async function create(input: { name: string, kind: string, stateCode: string, contactEmail: string | null, zoneMapId: number | null }) {
    const row = await $fetch('/api/jurisdictions', { method: 'POST', body: input })
    await refreshNuxtData('jurisdictions')
    return row
  }
  return { jurisdictions: data, refresh, create }
}

export function useJurisdiction(id: Ref<number>) {
  const { data, refresh, error } = useFetch(() => `/api/jurisdictions/${id.value}`, { key: `jurisdiction:${id.value}` })
  async function setCoverage(counties: string[], postalCodes: string[]) {
    await $fetch(`/api/jurisdictions/${id.value}/coverage`, { method: 'PUT', body: { counties, postalCodes } })
    await refresh()
  }
  async function addEdition(body: { name: string, ruleSetId: number, zoneMapId: number | null, effectiveFrom: string, effectiveUntil: string | null, notes: string }) {
    await $fetch(`/api/jurisdictions/${id.value}/editions`, { method: 'POST', body })
    await refresh()
  }
  async function updateEdition(editionId: number, body: { name: string, ruleSetId: number, zoneMapId: number | null, effectiveFrom: string, effectiveUntil: string | null, notes: string }) {
    await $fetch(`/api/editions/${editionId}`, { method: 'PATCH', body })
    await refresh()
  }
  async function removeEdition(editionId: number) {
    await $fetch(`/api/editions/${editionId}`, { method: 'DELETE' })
    await refresh()
  }
  async function update(body: { name: string, kind: string, stateCode: string, contactEmail: string | null, zoneMapId: number | null, notes: string }) {
    await $fetch(`/api/jurisdictions/${id.value}`, { method: 'PATCH', body })
    await refresh()
    await refreshNuxtData('jurisdictions')
  }
  return { jurisdiction: data, error, refresh, setCoverage, addEdition, updateEdition, removeEdition, update }
}

export function useAudit(entityType: 'zone-map' | 'rule-set' | 'jurisdiction', id: Ref<number>, enabled: Ref<boolean>) {
  const { data, refresh } = useFetch('/api/audit', {
    key: `audit:${entityType}:${id.value}`,
    query: computed(() => ({ entityType, entityId: id.value, limit: 20 })),
    immediate: enabled.value,
    server: false,
    default: () => [],
  })
  return { entries: data, refresh }
}

export type { ZoneColumns }
