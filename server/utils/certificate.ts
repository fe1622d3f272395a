import { randomBytes } from 'node:crypto'
import { PDFDocument, StandardFonts, rgb, type PDFFont, type PDFPage } from 'pdf-lib'
import { TEST_STAGE_WORDS } from '../../shared/filings/constants'
import { groupCode } from '../../shared/filings/schemas'
import type { CertificateData } from '../../shared/filings/types'

const BASE32 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZ234567' // RFC 4648 alphabet

/** 16 base32 characters = 80 random bits from the OS: unguessable, and unique by index. */
export function newVerificationCode(): string {
  const bytes = randomBytes(10)
  let bits = 0
  let value = 0
  let out = ''
  for (const byte of bytes) {
    value = (value << 8) | byte
    bits += 8
    while (bits >= 5) {
      out += BASE32[(value >>> (bits - 5)) & 31]
      bits -= 5
    }
  }
  return out
}

export function verifyUrl(base: string, code: string): string {
  return `${base}/verify/${code}`
}

/** Helvetica (a PDF standard font, nothing embedded from outside) speaks WinAnsi only: spell out the rest. */
function winAnsi(font: PDFFont, text: string): string {
  const spelled = text.replace(/≤/g, '<=').replace(/≥/g, '>=').replace(/≈/g, '~').replace(/−/g, '-').replace(/[\u2009\u202f]/g, ' ')
  let out = ''
  for (const ch of spelled) {
    try {
      font.encodeText(ch)
      out += ch
    }
    catch {
      out += '?'
    }
  }
  return out
}

function fmt(value: number | null, digits = 4): string {
  if (value === null || !Number.isFinite(value)) return '-'
  return Number(value.toPrecision(digits)).toLocaleString('en-US')
}

/**
 * The certificate as a one-page US Letter PDF (pdf-lib, Helvetica). The verification code is also
 * the document's Subject and a Keyword, so software can read it without parsing the page.
 */
export async function certificatePdf(data: CertificateData): Promise<Uint8Array> {
  const pdf = await PDFDocument.create()
  pdf.setTitle(`Air-leakage certificate ${groupCode(data.code)}`)
  pdf.setSubject(data.code)
  pdf.setKeywords([data.code, 'air leakage', 'blower door', data.permitNumber])
  pdf.setAuthor(data.jurisdictionName)
  pdf.setCreator('Tightwell')
  pdf.setProducer('Tightwell (pdf-lib)')
  const page: PDFPage = pdf.addPage([612, 792])
  const regular = await pdf.embedFont(StandardFonts.Helvetica)
  const bold = await pdf.embedFont(StandardFonts.HelveticaBold)
  const ink = rgb(0.06, 0.13, 0.13)
  const fir = rgb(0.14, 0.37, 0.36)
  let y = 730
  const line = (text: string, size = 11, font = regular, color = ink, x = 56) => {
    page.drawText(winAnsi(font, text), { x, y, size, font, color, maxWidth: 500 })
    y -= size + 7
  }
  const pair = (label: string, value: string) => {
    page.drawText(winAnsi(regular, label), { x: 56, y, size: 10, font: regular, color: rgb(0.35, 0.38, 0.42) })
    page.drawText(winAnsi(bold, value), { x: 210, y, size: 11, font: bold, color: ink, maxWidth: 346 })
    y -= 19
  }

  page.drawRectangle({ x: 40, y: 40, width: 532, height: 712, borderColor: fir, borderWidth: 2 })
  line('AIR-LEAKAGE TEST CERTIFICATE', 18, bold, fir)
  line(`${data.jurisdictionName} · accepted`, 12, regular)
  y -= 10
  pair('Address', data.address)
  pair('Permit', `${data.permitNumber} (permit date ${data.permitDate})`)
  pair('Test', `${TEST_STAGE_WORDS[data.stage]} test on ${data.testedOn}`)
  pair('CFM50', `${fmt(data.cfm50)} cfm at 50 Pa`)
  pair('ACH50', `${fmt(data.ach50)} air changes per hour at 50 Pa`)
  pair('Per enclosure area', data.cfm50PerEnclosureArea === null ? 'not given (no enclosure area)' : `${fmt(data.cfm50PerEnclosureArea, 3)} cfm per sq ft`)
  y -= 6
  line('Limit in force', 12, bold)
  for (const limit of data.limits) {
    line(limit.summary, 11)
    line(limit.citation, 9, regular, rgb(0.35, 0.38, 0.42))
  }
  if (data.edition) line(`Code edition in force on the permit date: ${data.edition}${data.ruleSetVersion ? ` (limits table version ${data.ruleSetVersion.number})` : ''}`, 9)
  y -= 6
  pair('Decision', `Accepted on ${data.decidedAt.slice(0, 10)} by ${data.decidedByName}`)
  pair('Rater', data.raterName)
  y -= 12
  line('Verification', 12, bold, fir)
  line(`Code: ${groupCode(data.code)}`, 14, bold)
  line(data.verifyUrl, 10)
  line('Anyone can confirm this certificate at the address above, without signing in.', 9)
  page.drawText(winAnsi(regular, 'Issued through Tightwell. The authority having jurisdiction decided this result.'), { x: 56, y: 60, size: 8, font: regular, color: rgb(0.35, 0.38, 0.42) })
  return pdf.save()
}
