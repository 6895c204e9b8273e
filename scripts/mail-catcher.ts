// The local fake SMTP server: accepts every message on 127.0.0.1, parses it with
// mailparser, keeps it in memory and in data/mail-<name>.jsonl, and serves what it caught:
//   GET /            a plain page listing the messages (for a developer's browser)
//   GET /messages    JSON, newest first; ?to=address filters
//   GET /messages/:id/attachments/:n   the attachment's bytes
//   DELETE /messages forget everything
//   POST /control?refuse=1|0   answer new mail with a temporary failure (451),
//                              to rehearse an outage
// Usage: tsx scripts/mail-catcher.ts [--smtp 1025] [--http 1080] [--name dev]
import { createServer } from 'node:http'
import { appendFileSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'

export interface CaughtMail {
  id: number
  date: string
  from: string
  to: string[]
  subject: string
  text: string
  html: string | null
  attachments: { filename: string, contentType: string, size: number, contentBase64: string }[]
}

export interface Catcher {
  smtpPort: number
  httpPort: number
  close(): Promise<void>
}

export async function startMailCatcher(opts: {
  smtpPort: number
  httpPort: number
  name: string
  quiet?: boolean
}): Promise<Catcher> {
  const dir = resolve(import.meta.dirname, '..', 'data')
  mkdirSync(dir, { recursive: true })
  const file = resolve(dir, `mail-${opts.name}.jsonl`)
  const messages: CaughtMail[] = existsSync(file)
    ? readFileSync(file, 'utf8')
        .split('\n')
        .filter(Boolean)
        .map(l => JSON.parse(l) as CaughtMail)
    : []
  let nextId = messages.reduce((m, x) => Math.max(m, x.id), 0) + 1
  let refusing = false

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    banner: 'Tiltwright mail catcher',
    async onData(stream, session, callback) {
      if (refusing) {
        stream.resume()
        stream.once('end', () =>
          callback(
            Object.assign(new Error('Mailbox temporarily unavailable, try again later'), {
              responseCode: 451,
            }),
          ),
        )
        return
      }
      try {
        const parsed = await simpleParser(stream)
        const to = session.envelope.rcptTo.map(r => r.address.toLowerCase())
        const mail: CaughtMail = {
          id: nextId++,
          date: new Date().toISOString(),
          from: parsed.from?.text ?? '',
          to,
          subject: parsed.subject ?? '',
          text: parsed.text ?? '',
          html: typeof parsed.html === 'string' ? parsed.html : null,
          attachments: parsed.attachments.map(a => ({
            filename: a.filename ?? 'attachment',
            contentType: a.contentType,
            size: a.size,
            contentBase64: a.content.toString('base64'),
          })),
        }
        messages.push(mail)
        appendFileSync(file, JSON.stringify(mail) + '\n')
        if (!opts.quiet)
          console.log(`[mail] caught #${mail.id} to ${to.join(', ')}: ${mail.subject}`)
        callback()
      } catch (e) {
        callback(e as Error)
      }
    },
  })

  const esc = (s: string) =>
    s.replace(/[&<>"]/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!)
  const http = createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://localhost')
    const json = (status: number, body: unknown) => {
      res.writeHead(status, { 'content-type': 'application/json' })
      res.end(JSON.stringify(body))
    }
    if (req.method === 'DELETE' && url.pathname === '/messages') {
      messages.length = 0
      writeFileSync(file, '')
      return json(200, { ok: true })
    }
    if (req.method === 'POST' && url.pathname === '/control') {
      refusing = url.searchParams.get('refuse') === '1'
      return json(200, { refusing })
    }
    if (req.method !== 'GET') return json(405, { error: 'method not allowed' })
    const att = url.pathname.match(/^\/messages\/(\d+)\/attachments\/(\d+)$/)
    if (att) {
      const m = messages.find(x => x.id === Number(att[1]))
      const a = m?.attachments[Number(att[2])]
      if (!a) return json(404, { error: 'no such attachment' })
      res.writeHead(200, {
        'content-type': a.contentType,
        'content-disposition': `inline; filename="${a.filename.replace(/"/g, '')}"`,
      })
      return res.end(Buffer.from(a.contentBase64, 'base64'))
    }
    if (url.pathname === '/messages') {
      const to = url.searchParams.get('to')?.toLowerCase()
      const list = [...messages]
        .reverse()
        .filter(m => !to || m.to.includes(to))
        .map(({ attachments, ...m }) => ({
          ...m,
          attachments: attachments.map(({ contentBase64, ...a }) => a),
        }))
      return json(200, { data: list })
    }
    if (url.pathname === '/') {
      res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' })
      const article = (m: (typeof messages)[number]) => {
        const files = m.attachments
          .map((a, i) => `<a href="/messages/${m.id}/attachments/${i}">${esc(a.filename)}</a>`)
          .join(' ')
        return '<article style="border-top:1px solid #ccc;padding:.5rem 0">'
          + `<h2 style="font-size:1rem">#${m.id} ${esc(m.subject)}</h2>`
          + `<p>To ${esc(m.to.join(', '))} · ${esc(m.date)}</p>`
          + `<pre style="white-space:pre-wrap">${esc(m.text)}</pre>${files}</article>`
      }
      return res.end('<!doctype html><meta charset="utf-8"><title>Caught mail</title>'
        + '<body style="font-family:sans-serif;max-width:60rem;margin:2rem auto">'
        + `<h1>Mail caught by the local fake SMTP server (${messages.length})</h1>`
        + [...messages].reverse().map(article).join('')
        + '</body>')
    }
    json(404, { error: 'not found' })
  })

  await new Promise<void>((ok, fail) => {
    smtp.once('error', fail)
    smtp.listen(opts.smtpPort, '127.0.0.1', () => ok())
  })
  await new Promise<void>((ok, fail) => {
    http.once('error', fail)
    http.listen(opts.httpPort, '127.0.0.1', () => ok())
  })
  return {
    smtpPort: opts.smtpPort,
    httpPort: opts.httpPort,
    close: () =>
      new Promise<void>((ok) => {
        http.close()
        smtp.close(() => ok())
      }),
  }
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) {
  const arg = (flag: string, def: string) => {
    const i = process.argv.indexOf(flag)
    return i > 0 ? process.argv[i + 1]! : def
  }
  const c = await startMailCatcher({
    smtpPort: Number(arg('--smtp', '1025')),
    httpPort: Number(arg('--http', '1080')),
    name: arg('--name', 'dev'),
  })
  console.log(
    `[mail] fake SMTP on 127.0.0.1:${c.smtpPort}; caught mail at http://127.0.0.1:${c.httpPort}/`,
  )
  const stop = () => {
    void c.close().then(() => process.exit(0))
  }
  process.on('SIGINT', stop)
  process.on('SIGTERM', stop)
}
