/** The stand-in's inbox for the admin "Mail log" page: received messages and their attachments. */
import { createError } from 'h3'
import { and, desc, eq, sql } from 'drizzle-orm'
import { useDB, tables } from './db'

const R = tables.receivedMail

export async function listReceivedMail(limit: number, offset: number) {
  const db = useDB()
  const [messages, [total]] = await Promise.all([
    db.select({
      id: R.id, receivedAt: R.receivedAt, listener: R.listener, envelopeTo: R.envelopeTo, messageId: R.messageId,
      subject: R.subject, fromHeader: R.fromHeader, toHeader: R.toHeader, attachments: R.attachments, size: R.size,
    }).from(R).orderBy(desc(R.id)).limit(limit).offset(offset),
    db.select({ n: sql<number>`count(*)::int` }).from(R),
  ])
  return { messages, total: total?.n ?? 0 }
}

/** One message with its bodies (the HTML is shown in a sandboxed frame, never inline). */
export async function receivedMailById(id: number) {
  const [row] = await useDB().select({
    id: R.id, receivedAt: R.receivedAt, listener: R.listener, envelopeFrom: R.envelopeFrom, envelopeTo: R.envelopeTo, messageId: R.messageId,
    subject: R.subject, fromHeader: R.fromHeader, toHeader: R.toHeader, textBody: R.textBody, htmlBody: R.htmlBody, attachments: R.attachments, size: R.size,
  }).from(R).where(eq(R.id, id))
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no received message ${id}.` })
  return row
}

export async function receivedAttachment(mailId: number, index: number) {
  const A = tables.receivedMailAttachments
  const [row] = await useDB().select().from(A).where(and(eq(A.mailId, mailId), eq(A.index, index)))
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `Message ${mailId} has no attachment ${index + 1}.` })
  return row
}
