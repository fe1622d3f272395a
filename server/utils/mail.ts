import { randomBytes } from 'node:crypto'
import { createTransport, type Transporter } from 'nodemailer'
import { SMTPServer } from 'smtp-server'
import { and, asc, eq, lte, lt } from 'drizzle-orm'
import type { H3Event } from 'h3'
import type { MailKind } from '../../shared/filings/constants'
import { mailCaptures, mailOutbox } from '../database/schema'

/**
 * E-mail notices. Every notice is first a row in mail_outbox, written in the same transaction as
 * the decision it announces; a worker (server/plugins/04.mail.ts) sends due rows and retries
 * failures with backoff, so a failed send never loses or undoes a decision.
 *
 * - TIGHTWELL_SMTP_HOST set: real SMTP (TIGHTWELL_SMTP_PORT, _SECURE, _USER, _PASSWORD).
 * - otherwise: a local capture SMTP server (smtp-server on 127.0.0.1, a free port) receives the
 *   mail into mail_captures, for the admin Outbox page and the tests. Nothing leaves the machine.
 */
export function mailMode(env: NodeJS.ProcessEnv = process.env): 'smtp' | 'capture' {
  return env.TIGHTWELL_SMTP_HOST ? 'smtp' : 'capture'
}

function envNumber(name: string, fallback: number): number {
  const raw = process.env[name]
  const n = raw === undefined || raw === '' ? fallback : Number(raw)
  return Number.isFinite(n) && n >= 0 ? n : fallback
}

export const mailSettings = () => ({
  from: process.env.TIGHTWELL_MAIL_FROM || 'Tightwell <no-reply@tightwell.test>',
  pollMs: envNumber('TIGHTWELL_MAIL_POLL_MS', 5000),
  retrySeconds: envNumber('TIGHTWELL_MAIL_RETRY_SECONDS', 60),
  maxAttempts: Math.max(1, envNumber('TIGHTWELL_MAIL_MAX_ATTEMPTS', 8)),
})

/** The public address of the app for links in mail and certificates. */
export function publicBaseUrl(event?: H3Event): string {
  const configured = process.env.TIGHTWELL_PUBLIC_URL
  if (configured) return configured.replace(/\/+$/, '')
  if (event) return getRequestURL(event).origin
  return `http://localhost:${process.env.PORT || 3000}`
}

export interface NewMail { kind: MailKind, to: string, subject: string, body: string, filingId: number | null }

/** The outbox row of a notice (inserted by the caller, inside its own transaction). */
export function outboxValues(mail: NewMail, now = new Date()) {
  return { kind: mail.kind, toAddress: mail.to, subject: mail.subject, body: mail.body, filingId: mail.filingId, status: 'queued' as const, attempts: 0, nextAttemptAt: now }
}

let capture: Promise<{ server: SMTPServer, port: number }> | undefined
let rejectLeft = envNumber('TIGHTWELL_MAIL_CAPTURE_REJECT', 0)

/** The local capture server, started on first use. TIGHTWELL_MAIL_CAPTURE_REJECT=N refuses the first N messages (tests of the retry). */
function captureServer(): Promise<{ server: SMTPServer, port: number }> {
  capture ??= new Promise((resolve, reject) => {
    const server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['AUTH', 'STARTTLS'],
      logger: false,
      size: 10 * 1024 * 1024,
      onData(stream, session, callback) {
        const chunks: Buffer[] = []
        stream.on('data', (c: Buffer) => chunks.push(c))
        stream.on('end', () => {
          if (rejectLeft > 0) {
            rejectLeft -= 1
            callback(Object.assign(new Error('Capture server refusing this message (TIGHTWELL_MAIL_CAPTURE_REJECT)'), { responseCode: 451 }))
            return
          }
          const raw = Buffer.concat(chunks).toString('utf8')
          const messageId = /^Message-ID:\s*(<[^>\r\n]+>)/im.exec(raw)?.[1] ?? null
          useDb().then(db => db.insert(mailCaptures).values({
            messageId,
            envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            envelopeTo: JSON.stringify(session.envelope.rcptTo.map(r => r.address)),
            raw,
          })).then(() => callback(), error => callback(error as Error))
        })
      },
    })
    server.on('error', error => console.error('[tightwell] capture SMTP server:', error.message))
    server.listen(0, '127.0.0.1', () => {
      const address = server.server.address()
      const port = typeof address === 'object' && address ? address.port : 0
      resolve({ server, port })
    })
    server.server.once('error', reject)
  })
  return capture
}

let transporter: Promise<Transporter> | undefined

function transport(): Promise<Transporter> {
  transporter ??= (async () => {
    if (mailMode() === 'smtp') {
      const user = process.env.TIGHTWELL_SMTP_USER
      return createTransport({
        host: process.env.TIGHTWELL_SMTP_HOST,
        port: envNumber('TIGHTWELL_SMTP_PORT', 587),
        secure: process.env.TIGHTWELL_SMTP_SECURE === '1',
        ...(user ? { auth: { user, pass: process.env.TIGHTWELL_SMTP_PASSWORD ?? '' } } : {}),
      })
    }
    const { port } = await captureServer()
    return createTransport({ host: '127.0.0.1', port, secure: false, ignoreTLS: true })
  })()
  return transporter
}

let draining: Promise<void> | undefined
let again = false

/** Sends what is due now. One drain at a time per process; rows are claimed so processes never send twice. */
export function drainMail(): Promise<void> {
  if (draining) {
    again = true
    return draining
  }
  draining = (async () => {
    do {
      again = false
      await drainOnce()
    } while (again)
  })().catch((error) => {
    console.error('[tightwell] mail worker:', (error as Error).message)
  }).finally(() => { draining = undefined })
  return draining
}

/** After a notice was queued: send it soon, not at the next poll. */
export function kickMail(): void {
  setImmediate(() => { void drainMail() })
}

/** A claim older than this is from a process that died mid-send: release it. */
const STALE_CLAIM_MS = 10 * 60_000

async function drainOnce(): Promise<void> {
  const db = await useDb()
  const now = new Date()
  await db.update(mailOutbox).set({ status: 'queued', claimedAt: null })
    .where(and(eq(mailOutbox.status, 'sending'), lt(mailOutbox.claimedAt, new Date(now.getTime() - STALE_CLAIM_MS))))
  const due = await db.select().from(mailOutbox)
    .where(and(eq(mailOutbox.status, 'queued'), lte(mailOutbox.nextAttemptAt, now)))
    .orderBy(asc(mailOutbox.nextAttemptAt)).limit(20)
  if (due.length === 0) return
  const settings = mailSettings()
  const tx = await transport()
  for (const mail of due) {
    const claim = await db.update(mailOutbox).set({ status: 'sending', claimedAt: new Date() })
      .where(and(eq(mailOutbox.id, mail.id), eq(mailOutbox.status, 'queued')))
    if (claim.rowsAffected !== 1) continue
    const messageId = `<tightwell-${mail.id}-${randomBytes(6).toString('hex')}@tightwell.local>`
    try {
      await tx.sendMail({ from: settings.from, to: mail.toAddress, subject: mail.subject, text: mail.body, messageId })
      await db.update(mailOutbox).set({ status: 'sent', sentAt: new Date(), attempts: mail.attempts + 1, messageId, lastError: null, claimedAt: null }).where(eq(mailOutbox.id, mail.id))
    }
    catch (error) {
      const attempts = mail.attempts + 1
      // Exponential backoff: retry, 2×, 4× … the base delay, at most six hours apart.
      const delayMs = Math.min(settings.retrySeconds * 1000 * 2 ** (attempts - 1), 6 * 3600_000)
      await db.update(mailOutbox).set({
        status: attempts >= settings.maxAttempts ? 'failed' : 'queued',
        attempts,
        lastError: String((error as Error).message ?? error).slice(0, 500),
        nextAttemptAt: new Date(Date.now() + delayMs),
        claimedAt: null,
      }).where(eq(mailOutbox.id, mail.id))
    }
  }
  // More may be due (a burst over 20): take the next batch.
  if (due.length === 20) again = true
}

export async function stopMail(): Promise<void> {
  const running = capture
  capture = undefined
  transporter = undefined
  if (running) {
    const { server } = await running
    await new Promise<void>(resolve => server.close(() => resolve()))
  }
}
