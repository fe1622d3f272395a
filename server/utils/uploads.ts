import { createHash, randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import { and, eq, ne } from 'drizzle-orm'
import { DEFAULT_UPLOAD_MAX_MB, type UploadKind } from '../../shared/filings/constants'
import { CONTENT_TYPES, detectFileType, safeDisplayName, type DetectedType } from '../../shared/filings/file-type'
import { filings, projects, uploads, type UploadRow } from '../database/schema'

/** The upload cap in bytes (TIGHTWELL_UPLOAD_MAX_MB, default 20 MB). */
export function uploadMaxBytes(): number {
  const mb = Number(process.env.TIGHTWELL_UPLOAD_MAX_MB || DEFAULT_UPLOAD_MAX_MB)
  return Math.round((Number.isFinite(mb) && mb > 0 ? mb : DEFAULT_UPLOAD_MAX_MB) * 1024 * 1024)
}

function megabytes(bytes: number): string {
  return `${Number((bytes / 1024 / 1024).toFixed(1))} MB`
}

function tooLarge(bytes: number | null) {
  const limit = uploadMaxBytes()
  const message = `${bytes === null ? 'The file' : `The file is ${megabytes(bytes)}; it`} is over the upload limit of ${megabytes(limit)} (${limit} bytes).`
  return createError({ statusCode: 413, statusMessage: 'Payload Too Large', message, data: { field: 'file', reason: `exceeds the ${megabytes(limit)} limit`, limitBytes: limit } })
}

const TYPE_WORDS: Record<DetectedType, string> = { jpeg: 'JPEG', png: 'PNG', pdf: 'PDF', csv: 'CSV (UTF-8 text)' }

function unsupported(accepted: readonly DetectedType[]) {
  const reason = `is not a ${accepted.map(t => TYPE_WORDS[t]).join(', ')} file by its content (the name does not decide)`
  return createError({ statusCode: 415, statusMessage: 'Unsupported Media Type', message: `file: ${reason}`, data: { field: 'file', reason } })
}

/** Multipart framing around the file: boundary lines and part headers. */
const MULTIPART_ALLOWANCE = 64 * 1024

export interface ReceivedFile { bytes: Uint8Array, type: DetectedType, name: string }

/**
 * Reads the multipart field "file". Over the cap → 413 before the body is read when the
 * Content-Length says so, or after reading; missing or empty → 400; content not among
 * `accepted` by its first bytes → 415.
 */
export async function receiveFile(event: H3Event, accepted: readonly DetectedType[]): Promise<ReceivedFile> {
  const max = uploadMaxBytes()
  const declared = Number(getRequestHeader(event, 'content-length'))
  if (Number.isFinite(declared) && declared > max + MULTIPART_ALLOWANCE) throw tooLarge(null)
  const type = getRequestHeader(event, 'content-type') ?? ''
  if (!type.toLowerCase().startsWith('multipart/form-data')) throw badRequest([{ field: 'file', reason: 'send the file as multipart/form-data in a field named "file"' }])
  let parts: Awaited<ReturnType<typeof readMultipartFormData>>
  try {
    parts = await readMultipartFormData(event)
  }
  catch {
    throw badRequest([{ field: 'file', reason: 'the multipart body could not be read' }])
  }
  const part = parts?.find(p => p.name === 'file' && p.filename !== undefined)
  if (!part) throw badRequest([{ field: 'file', reason: 'is required (a multipart field named "file" with a file in it)' }])
  if (part.data.byteLength === 0) throw badRequest([{ field: 'file', reason: 'is empty' }])
  if (part.data.byteLength > max) throw tooLarge(part.data.byteLength)
  const bytes = new Uint8Array(part.data.buffer, part.data.byteOffset, part.data.byteLength)
  const detected = detectFileType(bytes, accepted)
  if (!detected) throw unsupported(accepted)
  return { bytes, type: detected, name: safeDisplayName(part.filename, detected) }
}

export function kindOf(type: DetectedType): UploadKind {
  return type === 'csv' ? 'readings' : type === 'pdf' ? 'document' : 'photo'
}

/**
 * Stores the bytes under a generated key (never the user's name or path) and records the row.
 * The row is written after the bytes; when the row cannot be written the bytes are removed.
 */
export async function storeUpload(user: User, projectId: number, testId: number, file: ReceivedFile): Promise<UploadRow> {
  const key = `p${projectId}:${randomBytes(16).toString('hex')}`
  const storage = uploadsStorage()
  await storage.setItemRaw(key, file.bytes)
  try {
    const db = await useDb()
    const [row] = await db.insert(uploads).values({
      projectId,
      testId,
      storageKey: key,
      kind: kindOf(file.type),
      contentType: CONTENT_TYPES[file.type],
      name: file.name,
      size: file.bytes.byteLength,
      sha256: createHash('sha256').update(file.bytes).digest('hex'),
      uploadedById: user.id,
    }).returning()
    return row!
  }
  catch (error) {
    await storage.removeItem(key).catch(() => {})
    throw error
  }
}

export async function readUploadBytes(row: UploadRow): Promise<Uint8Array | null> {
  const raw = await uploadsStorage().getItemRaw<ArrayBuffer | Uint8Array>(row.storageKey)
  if (raw === null || raw === undefined) return null
  return raw instanceof Uint8Array ? raw : new Uint8Array(raw)
}

/**
 * An upload the user may see: the project's rater and admins always; a plan reviewer when the
 * test is filed (not a draft) with the reviewer's jurisdiction. Anyone else: 404.
 */
export async function findUploadFor(user: User, id: number): Promise<{ upload: UploadRow, ownerId: number }> {
  const db = await useDb()
  const [row] = await db.select({ upload: uploads, ownerId: projects.ownerId }).from(uploads)
    .innerJoin(projects, eq(projects.id, uploads.projectId)).where(eq(uploads.id, id))
  const notFound = rowNotFound('file', id)
  if (!row) throw notFound
  if (user.role === 'admin' || (user.role === 'rater' && row.ownerId === user.id)) return row
  if (user.role === 'reviewer' && user.jurisdictionId !== null && row.upload.testId !== null) {
    const filing = await db.query.filings.findFirst({
      columns: { id: true },
      where: and(eq(filings.testId, row.upload.testId), eq(filings.jurisdictionId, user.jurisdictionId), ne(filings.status, 'draft')),
    })
    if (filing) return row
  }
  throw notFound
}
