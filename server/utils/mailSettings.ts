/**
 * Mail configuration from the environment, shared by the web server (composing, the From address)
 * and the worker (sending). No Nitro globals here: the worker imports this file directly.
 *
 *   TESSERA_SMTP_HOST / _PORT       relay address (default 127.0.0.1:2525, the local stand-in)
 *   TESSERA_SMTP_USER / _PASSWORD   login, when the relay wants one
 *   TESSERA_SMTP_SECURE             true: TLS from the first byte (usually port 465); otherwise
 *                                   STARTTLS is required, except on loopback (the stand-in)
 *   TESSERA_MAIL_FROM               From header, e.g. "Tessera forecasting office <briefings@office.example>"
 *   TESSERA_MAIL_RETRY_SECONDS      first retry delay, doubled per attempt up to an hour (default 30)
 *   TESSERA_MAIL_MAX_ATTEMPTS       attempts before a message is marked failed (default 8)
 */
import type { SMTPConnectionOptions } from 'nodemailer/lib/smtp-connection'

export interface MailSettings {
  host: string
  port: number
  user: string | null
  password: string | null
  secure: boolean
  from: string
  /** Domain of the From address, used to make Message-IDs. */
  fromDomain: string
  retrySeconds: number
  maxAttempts: number
}

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '::1'])
export const DEFAULT_STAND_IN_PORT = 2525

function positiveNumber(value: string | undefined, fallback: number, name: string): number {
  if (value === undefined || value === '') return fallback
  const n = Number(value)
  if (!Number.isFinite(n) || n <= 0) throw new Error(`${name} must be a positive number (got "${value}")`)
  return n
}

/** Reads the settings (throws with the variable's name when one is malformed). */
export function mailSettings(env: NodeJS.ProcessEnv = process.env): MailSettings {
  const from = env.TESSERA_MAIL_FROM?.trim() || 'Tessera forecasting office <briefings@tessera.example>'
  const address = /<([^>]+)>/.exec(from)?.[1] ?? from
  const fromDomain = address.split('@')[1]?.trim().toLowerCase() || 'tessera.example'
  return {
    host: env.TESSERA_SMTP_HOST?.trim() || '127.0.0.1',
    port: positiveNumber(env.TESSERA_SMTP_PORT, DEFAULT_STAND_IN_PORT, 'TESSERA_SMTP_PORT'),
    user: env.TESSERA_SMTP_USER || null,
    password: env.TESSERA_SMTP_PASSWORD || null,
    secure: env.TESSERA_SMTP_SECURE === 'true',
    from,
    fromDomain,
    retrySeconds: positiveNumber(env.TESSERA_MAIL_RETRY_SECONDS, 30, 'TESSERA_MAIL_RETRY_SECONDS'),
    maxAttempts: Math.round(positiveNumber(env.TESSERA_MAIL_MAX_ATTEMPTS, 8, 'TESSERA_MAIL_MAX_ATTEMPTS')),
  }
}

/**
 * nodemailer SMTP connection options. Plain SMTP without TLS only towards loopback (the stand-in
 * has STARTTLS disabled); any other relay must offer STARTTLS or the send fails.
 * Short timeouts keep one attempt well inside the database's idle-transaction limit.
 */
export function smtpConnectionOptions(s: MailSettings): SMTPConnectionOptions {
  const loopback = LOOPBACK.has(s.host)
  return {
    host: s.host,
    port: s.port,
    secure: s.secure,
    ...(s.secure ? {} : loopback ? { ignoreTLS: true } : { requireTLS: true }),
    name: s.fromDomain,
    connectionTimeout: 15_000,
    greetingTimeout: 15_000,
    socketTimeout: 60_000,
  }
}

/**
 * Delay before attempt `attempt + 1` after `attempt` failed attempts: base · 2^(attempt−1),
 * at most an hour (exponential backoff; no jitter, a handful of messages at a time).
 */
export function retryDelaySeconds(attempt: number, baseSeconds: number): number {
  return Math.min(3600, baseSeconds * 2 ** Math.max(0, attempt - 1))
}
