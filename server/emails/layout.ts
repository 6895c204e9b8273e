// Every Tiltwright e-mail has a text part and a simple HTML part built from the same lines.
export interface RenderedMail {
  subject: string
  text: string
  html: string
}

const escape = (s: string) =>
  s.replace(
    /[&<>"']/g,
    c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c]!,
  )

export interface MailBlock {
  paragraph?: string
  link?: { label: string, url: string }
}

export function renderMail(
  subject: string,
  greeting: string,
  blocks: MailBlock[],
  footer = 'Tiltwright — balancing-rig kits for classrooms',
): RenderedMail {
  const text = [
    greeting,
    '',
    ...blocks.flatMap(b =>
      b.paragraph ? [b.paragraph, ''] : b.link ? [`${b.link.label}: ${b.link.url}`, ''] : [],
    ),
    '—',
    footer,
  ].join('\n')
  const block = (b: (typeof blocks)[number]) => {
    if (b.paragraph) return `<p>${escape(b.paragraph)}</p>`
    if (b.link) return `<p><a href="${escape(b.link.url)}">${escape(b.link.label)}</a></p>`
    return ''
  }
  const html = '<!doctype html><html>'
    + '<body style="font-family:Nunito,Arial,sans-serif;color:#1f2a37;line-height:1.5">\n'
    + `<p>${escape(greeting)}</p>\n`
    + `${blocks.map(block).join('\n')}\n`
    + `<p style="color:#6b7280;font-size:12px">${escape(footer)}</p></body></html>`
  return { subject, text, html }
}
