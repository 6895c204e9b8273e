// Which address a request comes from. X-Forwarded-For is believed only when the direct peer
// is one of the configured trusted proxies; then the nearest address that is not itself a
// trusted proxy (reading from the right, as each proxy appends) is the client.

const normalise = (a: string) =>
  a
    .trim()
    .replace(/^::ffff:/, '')
    .replace(/^\[(.*)\]$/, '$1')

export function parseTrustedProxies(setting: string): string[] {
  return setting.split(',').map(normalise).filter(Boolean)
}

export function clientAddress(
  peer: string | undefined,
  forwardedFor: string | undefined,
  trusted: string[],
): string {
  const direct = normalise(peer ?? '') || 'unknown'
  if (!trusted.includes(direct) || !forwardedFor) return direct.slice(0, 64)
  const hops = forwardedFor.split(',').map(normalise).filter(Boolean)
  for (let i = hops.length - 1; i >= 0; i--) {
    if (!trusted.includes(hops[i]!)) return hops[i]!.slice(0, 64)
  }
  return direct.slice(0, 64)
}
