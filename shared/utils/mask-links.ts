// Single-use links (password resets, staff invitations, address confirmations) are masked
// wherever staff could read a caught mail: a visible link would let its reader take over
// the account. Only the first characters of the token stay, to tell two mails apart.
const SINGLE_USE = /(reset-password\/|verify-email\?token=)([A-Za-z0-9_-]{4})[A-Za-z0-9_-]+/g

export function maskSingleUseLinks(text: string): string {
  return text.replace(SINGLE_USE, '$1$2…(hidden)')
}
