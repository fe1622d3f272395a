import { mapLimitRecords, readCsv } from '../../shared/rules/csv'
import type { RuleRow } from '../../shared/rules/table'

export interface ModelTableMeta { file: string, name: string, code: string, edition: string, description: string }
export interface ModelTable extends ModelTableMeta { rules: RuleRow[] }

/**
 * The model limit tables shipped in rules/ (bundled as server assets): the manifest index.json
 * and one limits CSV per table, read with the same importer an admin's upload goes through.
 */
export async function loadModelTables(): Promise<ModelTable[]> {
  const storage = useStorage('assets:rules')
  const manifest = await storage.getItem<{ tables: ModelTableMeta[] }>('index.json')
  if (!manifest?.tables) throw new Error('rules/index.json is missing from the server assets')
  const tables: ModelTable[] = []
  for (const meta of manifest.tables) {
    const raw = await storage.getItemRaw<string | Uint8Array>(meta.file)
    if (raw == null) throw new Error(`rules/${meta.file} is missing from the server assets`)
    const text = typeof raw === 'string' ? raw : new TextDecoder().decode(raw)
    const mapped = mapLimitRecords(readCsv(text))
    if (mapped.problems.length) throw new Error(`rules/${meta.file}: ${mapped.problems.map(p => `line ${p.line}, ${p.column}: ${p.reason}`).join('; ')}`)
    tables.push({ ...meta, rules: mapped.rows.map(r => r.rule) })
  }
  return tables
}
