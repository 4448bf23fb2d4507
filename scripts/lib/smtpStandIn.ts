/**
 * The local SMTP stand-in for a real mail relay: listens on loopback, accepts any envelope
 * (no login, no STARTTLS), parses each message with mailparser and stores it, with its
 * attachments, in received_mail (the admin "Mail log" page reads it). Demo and tests only.
 *
 * For tests it can also misbehave like a relay in trouble: refuse the first N RCPT TO or DATA
 * commands with a temporary 451, or pause before answering RCPT TO or the end of DATA.
 */
import { createHash } from 'node:crypto'
import { SMTPServer, type SMTPServerSession } from 'smtp-server'
import { simpleParser, type AddressObject } from 'mailparser'
import { useDB, tables, type Database } from '../../server/utils/db'

export interface StandInOptions {
  port: number
  host?: string
  /** Name stored with each message (defaults to "stand-in:<port>"). */
  listener?: string
  refuseFirstRcpt?: number
  refuseFirstData?: number
  /** Reply code of those refusals: 451 (temporary, the default) or a permanent 5xx. */
  refuseCode?: number
  /** Pause before answering RCPT TO (ms). */
  rcptDelayMs?: number
  /** Pause after storing a message and before answering its end of data (ms). */
  dataDelayMs?: number
  /** Where messages go; the database by default. */
  store?: (message: ParsedMessage) => Promise<number | void>
  log?: (message: string) => void
}

export interface ParsedMessage {
  listener: string
  envelopeFrom: string | null
  envelopeTo: string[]
  raw: Buffer
  messageId: string | null
  subject: string | null
  fromHeader: string | null
  toHeader: string | null
  textBody: string | null
  htmlBody: string | null
  attachments: { index: number; filename: string | null; contentType: string; size: number; sha256: string; content: Buffer }[]
}

export interface StandIn {
  port: number
  counts: { rcpt: number; data: number; stored: number }
  close(): Promise<void>
}

const addressText = (a: AddressObject | AddressObject[] | undefined) => (a ? (Array.isArray(a) ? a.map((x) => x.text).join(', ') : a.text) : null)

/** Parses a raw message as it arrived. */
export async function parseMessage(raw: Buffer, session: Pick<SMTPServerSession, 'envelope'>, listener: string): Promise<ParsedMessage> {
  const parsed = await simpleParser(raw)
  const from = session.envelope.mailFrom
  return {
    listener,
    envelopeFrom: from ? from.address : null,
    envelopeTo: session.envelope.rcptTo.map((r) => r.address),
    raw,
    messageId: parsed.messageId ?? null,
    subject: parsed.subject ?? null,
    fromHeader: addressText(parsed.from),
    toHeader: addressText(parsed.to),
    textBody: parsed.text ?? null,
    htmlBody: typeof parsed.html === 'string' ? parsed.html : null,
    attachments: parsed.attachments.map((att, index) => ({
      index,
      filename: att.filename ?? null,
      contentType: att.contentType,
      size: att.content.length,
      sha256: createHash('sha256').update(att.content).digest('hex'),
      content: att.content,
    })),
  }
}

/** Stores one parsed message and its attachments; returns the received_mail id. */
export async function storeReceivedMail(m: ParsedMessage, db: Database = useDB()): Promise<number> {
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(tables.receivedMail).values({
      listener: m.listener, envelopeFrom: m.envelopeFrom, envelopeTo: m.envelopeTo, messageId: m.messageId, subject: m.subject,
      fromHeader: m.fromHeader, toHeader: m.toHeader, textBody: m.textBody, htmlBody: m.htmlBody, size: m.raw.length, raw: m.raw,
      attachments: m.attachments.map(({ content: _c, ...meta }) => meta),
    }).returning({ id: tables.receivedMail.id })
    if (m.attachments.length) {
      await tx.insert(tables.receivedMailAttachments).values(m.attachments.map((att) => ({
        mailId: row!.id, index: att.index, filename: att.filename, contentType: att.contentType, sha256: att.sha256, content: att.content,
      })))
    }
    return row!.id
  })
}

const refusal = (message: string, code: number) => Object.assign(new Error(message), { responseCode: code })
const pause = (ms: number) => new Promise((r) => setTimeout(r, ms))

/** Starts a stand-in; resolves once it listens. */
export async function startSmtpStandIn(opts: StandInOptions): Promise<StandIn> {
  const listener = opts.listener ?? `stand-in:${opts.port}`
  const log = opts.log ?? (() => {})
  const store = opts.store ?? ((m: ParsedMessage) => storeReceivedMail(m))
  const counts = { rcpt: 0, data: 0, stored: 0 }
  const server = new SMTPServer({
    name: 'tessera-stand-in.local',
    banner: 'Tessera local mail stand-in (stores messages for the Mail log; delivers nothing)',
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    size: 30 * 1024 * 1024,
    logger: false,
    async onRcptTo(_address, _session, callback) {
      counts.rcpt++
      if (opts.rcptDelayMs) await pause(opts.rcptDelayMs)
      if (counts.rcpt <= (opts.refuseFirstRcpt ?? 0)) return callback(refusal('Refused (the stand-in is refusing recipients for a test)', opts.refuseCode ?? 451))
      callback()
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = []
      stream.on('data', (c: Buffer) => chunks.push(c))
      stream.on('error', (err) => callback(err))
      stream.on('end', async () => {
        counts.data++
        if (counts.data <= (opts.refuseFirstData ?? 0)) return callback(refusal('Refused (the stand-in is refusing messages for a test)', opts.refuseCode ?? 451))
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) return callback(Object.assign(new Error('Message too large'), { responseCode: 552 }))
        try {
          const message = await parseMessage(Buffer.concat(chunks), session, listener)
          const id = await store(message)
          counts.stored++
          log(`stored "${message.subject ?? '(no subject)'}" for ${message.envelopeTo.join(', ')}${id ? ` as #${id}` : ''}`)
          // Like a real relay: the message is kept first, then the "250" is sent.
          if (opts.dataDelayMs) await pause(opts.dataDelayMs)
          callback(null, `Stored${id ? ` as ${id}` : ''}`)
        } catch (err) {
          log(`could not store a message: ${(err as Error).message}`)
          callback(Object.assign(new Error('Could not store the message'), { responseCode: 451 }))
        }
      })
    },
  })
  server.on('error', (err) => log(`error: ${err.message}`))
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(opts.port, opts.host ?? '127.0.0.1', () => resolve())
  })
  return {
    port: opts.port,
    counts,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  }
}
