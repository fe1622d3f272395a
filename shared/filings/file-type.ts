/**
 * What a file is, decided by its first bytes — never by its name or the browser's claim.
 * Signatures: JPEG FF D8 FF (JFIF/Exif SOI + marker), PNG 89 50 4E 47 0D 0A 1A 0A (PNG spec §5.2),
 * PDF "%PDF-" (ISO 32000-1 §7.5.2). A readings CSV has no signature: it must be valid UTF-8 text
 * with no NUL byte (a binary file almost always has one within its first kilobytes).
 */
export type DetectedType = 'jpeg' | 'png' | 'pdf' | 'csv'

export const CONTENT_TYPES: Record<DetectedType, string> = {
  jpeg: 'image/jpeg',
  png: 'image/png',
  pdf: 'application/pdf',
  csv: 'text/csv; charset=utf-8',
}

export const EXTENSIONS: Record<DetectedType, string> = { jpeg: 'jpg', png: 'png', pdf: 'pdf', csv: 'csv' }

const JPEG = [0xFF, 0xD8, 0xFF]
const PNG = [0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A]
const PDF = [0x25, 0x50, 0x44, 0x46, 0x2D] // %PDF-

function startsWith(bytes: Uint8Array, signature: readonly number[]): boolean {
  if (bytes.length < signature.length) return false
  return signature.every((b, i) => bytes[i] === b)
}

/** True for valid UTF-8 without NUL bytes (a UTF-8 byte-order mark is allowed). */
export function isUtf8Text(bytes: Uint8Array): boolean {
  if (bytes.includes(0)) return false
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes)
    return true
  }
  catch {
    return false
  }
}

/** The binary types by signature; null when none matches. */
export function sniffBinary(bytes: Uint8Array): Exclude<DetectedType, 'csv'> | null {
  if (startsWith(bytes, JPEG)) return 'jpeg'
  if (startsWith(bytes, PNG)) return 'png'
  if (startsWith(bytes, PDF)) return 'pdf'
  return null
}

/**
 * The type of an upload among the `accepted` ones, or null. Binary signatures are tried first, so
 * a PDF is never taken for text even when it happens to be valid UTF-8.
 */
export function detectFileType(bytes: Uint8Array, accepted: readonly DetectedType[]): DetectedType | null {
  const binary = sniffBinary(bytes)
  if (binary) return accepted.includes(binary) ? binary : null
  if (accepted.includes('csv') && isUtf8Text(bytes)) return 'csv'
  return null
}

/**
 * A display name safe to store and to echo: the last path segment only (no folders, drive
 * letters or "..": the storage key is generated and never built from it), control and
 * separator characters removed, at most 120 characters, never empty.
 */
export function safeDisplayName(name: string | undefined, type: DetectedType): string {
  const last = (name ?? '').split(/[\\/]/).pop() ?? ''
  // eslint-disable-next-line no-control-regex
  const cleaned = last.replace(/[\u0000-\u001f\u007f"<>|:*?]/g, '').replace(/^\.+/, '').trim().slice(-120)
  return cleaned || `file.${EXTENSIONS[type]}`
}

/** The value of Content-Disposition: ASCII fallback plus the RFC 6266/5987 UTF-8 form. */
export function contentDisposition(kind: 'inline' | 'attachment', name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\;]/g, '_')
  return `${kind}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`
}
