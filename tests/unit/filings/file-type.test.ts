import { describe, expect, it } from 'vitest'
import { contentDisposition, detectFileType, isUtf8Text, safeDisplayName } from '#shared/filings'

const bytes = (...b: number[]) => Uint8Array.from(b)
const text = (s: string) => new TextEncoder().encode(s)

// Signatures: JPEG SOI FF D8 FF (ITU T.81 Annex B), PNG 89 50 4E 47 0D 0A 1A 0A (PNG spec §5.2), PDF "%PDF-" (ISO 32000-1 §7.5.2).
describe('file type by content (magic bytes)', () => {
  it.each([
    ['jpeg', bytes(0xFF, 0xD8, 0xFF, 0xE0, 0, 0x10)],
    ['png', bytes(0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0)],
    ['pdf', text('%PDF-1.7\n')],
    ['csv', text('Pressure,Flow\n-50,1020\n')],
  ] as const)('%s', (type, data) => {
    expect(detectFileType(data, ['jpeg', 'png', 'pdf', 'csv'])).toBe(type)
  })

  it('refuses what is not accepted, whatever it claims to be', () => {
    expect(detectFileType(text('Pressure,Flow'), ['jpeg', 'png', 'pdf'])).toBeNull()
    expect(detectFileType(bytes(0x4D, 0x5A, 0x90, 0), ['jpeg', 'png', 'pdf', 'csv'])).toBeNull() // "MZ" executable with a NUL
    expect(detectFileType(bytes(0x89, 0x50, 0x4E, 0x47), ['jpeg', 'png'])).toBeNull() // truncated PNG signature
    expect(detectFileType(text('%PDF-1.4'), ['csv'])).toBeNull() // a PDF is never taken for text
    expect(detectFileType(bytes(0xFF, 0xD8), ['jpeg'])).toBeNull()
  })

  it('text must be valid UTF-8 without NUL', () => {
    expect(isUtf8Text(text('été,1\n'))).toBe(true)
    expect(isUtf8Text(bytes(0x61, 0x00, 0x62))).toBe(false)
    expect(isUtf8Text(bytes(0xC3, 0x28))).toBe(false) // invalid 2-byte sequence
  })
})

describe('display names never carry a path', () => {
  it.each([
    ['../../../etc/passwd', 'passwd'],
    ['C:\\Users\\me\\photo.jpg', 'photo.jpg'],
    ['..\\..\\boot.ini', 'boot.ini'],
    ['....', 'file.png'],
    ['', 'file.png'],
    ['fan "door".png', 'fan door.png'],
    ['a\u0000b.png', 'ab.png'],
  ])('%j → %j', (name, expected) => {
    expect(safeDisplayName(name, 'png')).toBe(expected)
  })

  it('Content-Disposition has an ASCII fallback and the UTF-8 name (RFC 6266)', () => {
    expect(contentDisposition('attachment', 'Plan été.pdf')).toBe('attachment; filename="Plan _t_.pdf"; filename*=UTF-8\'\'Plan%20%C3%A9t%C3%A9.pdf')
  })
})
