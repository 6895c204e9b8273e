// The ticket rules the server and the pages share (shared/utils/tickets.ts): how a message moves
// a ticket, the byte counts people read, the ticket's reference and the words of the upload
// limits (docs/tickets.md).
import { describe, expect, it } from 'vitest'
import { ROLES } from '../../shared/utils/roles'
import {
  ATTACHMENT_ACCEPT,
  ATTACHMENT_LIMIT_BYTES,
  ATTACHMENT_MAX_BYTES,
  ATTACHMENT_RULE,
  ATTACHMENT_TYPES,
  ATTACHMENTS_PER_MESSAGE,
  PRIORITY_RANK,
  TICKET_AGE_HOURS,
  TICKET_AGES,
  TICKET_PRIORITY_LABELS,
  TICKET_STATUS_FOR_CUSTOMER,
  TICKET_STATUS_LABELS,
  formatBytes,
  statusAfterMessage,
  ticketRef,
} from '../../shared/utils/tickets'
import { ATTACHMENT_KINDS, TICKET_PRIORITIES, TICKET_STATUSES } from '../../shared/utils/states'

describe('statusAfterMessage', () => {
  it.each([
    ['teacher', false, 'needs reply'],
    ['teacher', true, 'needs reply'],
    ['builder', false, 'needs reply'],
    // A customer cannot resolve with a message: it always goes back to the staff.
    ['builder', true, 'needs reply'],
    ['support', false, 'awaiting builder'],
    ['support', true, 'resolved'],
    ['admin', false, 'awaiting builder'],
    ['admin', true, 'resolved'],
  ] as const)('a %s\'s message (resolve: %s) leaves it "%s"', (role, resolve, status) => {
    expect(statusAfterMessage(role, resolve)).toBe(status)
  })

  it('hands a staff reply to the customer side when nothing is said about resolving', () => {
    expect(statusAfterMessage('support')).toBe('awaiting builder')
    expect(statusAfterMessage('teacher')).toBe('needs reply')
  })

  it('answers a known status for every role', () => {
    for (const role of ROLES)
      for (const resolve of [false, true])
        expect(TICKET_STATUSES).toContain(statusAfterMessage(role, resolve))
  })
})

describe('formatBytes', () => {
  it.each([
    [0, '0 B'],
    [1, '1 B'],
    [1023, '1023 B'],
    [1024, '1 KB'],
    [850 * 1024, '850 KB'],
    [1024 * 1024 - 1, '1024 KB'],
    [1024 * 1024, '1.0 MB'],
    [3.4 * 1024 * 1024, '3.4 MB'],
    [8 * 1024 * 1024, '8.0 MB'],
    [40 * 1024 * 1024, '40.0 MB'],
  ])('%i bytes read "%s"', (n, words) => {
    expect(formatBytes(n)).toBe(words)
  })
})

describe('ticketRef', () => {
  it('names a ticket as people say it', () => {
    expect(ticketRef(12)).toBe('T-12')
    expect(ticketRef(1042)).toBe('T-1042')
  })
})

describe('the attachment limits', () => {
  it('says each kind\'s limit in the words of its own constant', () => {
    expect(ATTACHMENT_RULE).toContain(`Photos (PNG, JPEG, WebP) up to `
      + `${formatBytes(ATTACHMENT_LIMIT_BYTES.image)}`)
    expect(ATTACHMENT_RULE).toContain(`PDFs up to ${formatBytes(ATTACHMENT_LIMIT_BYTES.pdf)}`)
    expect(ATTACHMENT_RULE).toContain(`(MP4, MOV, WebM) up to `
      + `${formatBytes(ATTACHMENT_LIMIT_BYTES.video)}`)
    expect(ATTACHMENT_RULE).toContain(`at most ${ATTACHMENTS_PER_MESSAGE} files a message`)
  })

  it('states today\'s numbers: 8 MB photos and PDFs, 40 MB videos, six files', () => {
    expect(ATTACHMENT_RULE).toBe(
      'Photos (PNG, JPEG, WebP) up to 8.0 MB, PDFs up to 8.0 MB, short videos (MP4, MOV, WebM) '
      + 'up to 40.0 MB; at most 6 files a message.',
    )
  })

  it('names every accepted type\'s format in the rule, and accepts only those types', () => {
    const names: Record<string, string> = {
      'image/png': 'PNG',
      'image/jpeg': 'JPEG',
      'image/webp': 'WebP',
      'application/pdf': 'PDF',
      'video/mp4': 'MP4',
      'video/quicktime': 'MOV',
      'video/webm': 'WebM',
    }
    expect(Object.keys(ATTACHMENT_TYPES).sort()).toEqual(Object.keys(names).sort())
    for (const name of Object.values(names)) expect(ATTACHMENT_RULE).toContain(name)
    expect(ATTACHMENT_ACCEPT.split(',').sort()).toEqual(Object.keys(names).sort())
  })

  it('has a limit for every kind, and the largest is the upload route\'s limit', () => {
    for (const kind of ATTACHMENT_KINDS) expect(ATTACHMENT_LIMIT_BYTES[kind]).toBeGreaterThan(0)
    expect(new Set(Object.values(ATTACHMENT_TYPES))).toEqual(new Set(ATTACHMENT_KINDS))
    expect(ATTACHMENT_MAX_BYTES).toBe(ATTACHMENT_LIMIT_BYTES.video)
  })
})

describe('the words and orders of states', () => {
  it('labels every status for the staff and for the customer, and every priority', () => {
    // Each word list names every value once, and no two values read alike.
    for (const labels of [TICKET_STATUS_LABELS, TICKET_STATUS_FOR_CUSTOMER]) {
      expect(Object.keys(labels).sort()).toEqual([...TICKET_STATUSES].sort())
      expect(new Set(Object.values(labels)).size).toBe(TICKET_STATUSES.length)
    }
    expect(Object.keys(TICKET_PRIORITY_LABELS).sort()).toEqual([...TICKET_PRIORITIES].sort())
    expect(new Set(Object.values(TICKET_PRIORITY_LABELS)).size).toBe(TICKET_PRIORITIES.length)
  })

  it('ranks urgent above normal above low', () => {
    expect(PRIORITY_RANK.urgent).toBeGreaterThan(PRIORITY_RANK.normal)
    expect(PRIORITY_RANK.normal).toBeGreaterThan(PRIORITY_RANK.low)
  })

  it('lists the queue\'s ages from the youngest to the oldest', () => {
    const hours = TICKET_AGES.map(a => TICKET_AGE_HOURS[a])
    expect(hours).toEqual([...hours].sort((a, b) => a - b))
    expect(TICKET_AGE_HOURS['1d']).toBe(24)
  })
})
