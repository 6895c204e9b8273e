// The mail adapter: nodemailer over SMTP. Locally the SMTP server is the fake one that
// scripts/mail-catcher.ts runs; in production it is any relay. Only configuration differs.
import nodemailer from 'nodemailer'
import type { Transporter } from 'nodemailer'

export interface OutgoingMail {
  to: string
  subject: string
  text: string
  html?: string | null
  attachments?: { filename: string, contentType: string, content: Buffer }[]
}

export interface MailTransport {
  send(mail: OutgoingMail): Promise<void>
  close(): void
}

let transport: (MailTransport & { key: string }) | undefined

export function useMailTransport(): MailTransport {
  const cfg = useRuntimeConfig()
  const key = `${cfg.smtpHost}:${cfg.smtpPort}`
  if (!transport || transport.key !== key) {
    const t: Transporter = nodemailer.createTransport({
      host: cfg.smtpHost,
      port: Number(cfg.smtpPort),
      secure: false,
      ignoreTLS: cfg.smtpHost === '127.0.0.1',
      connectionTimeout: 5000,
      greetingTimeout: 5000,
      socketTimeout: 10_000,
      auth: cfg.smtpUser ? { user: cfg.smtpUser, pass: cfg.smtpPassword } : undefined,
    })
    transport = {
      key,
      async send(mail) {
        await t.sendMail({
          from: cfg.mailFrom,
          to: mail.to,
          subject: mail.subject,
          text: mail.text,
          html: mail.html ?? undefined,
          attachments: mail.attachments,
        })
      },
      close: () => t.close(),
    }
  }
  return transport
}
