import { hoursInWords, LINK_LIFETIME_HOURS } from '../../shared/utils/lifetimes'
import { renderMail } from './layout'

export function staffInvitationMail(name: string, invitedBy: string, role: string, url: string) {
  return renderMail('You have a Tiltwright staff account', name, [
    {
      paragraph:
        `${invitedBy} has added you to Tiltwright as `
        + `${role === 'admin' ? 'an admin' : 'a member of the support team'}.`,
    },
    { paragraph: 'Choose your password to sign in:' },
    { link: { label: 'Choose my password', url } },
    {
      paragraph:
        'The link works once and expires in '
        + `${hoursInWords(LINK_LIFETIME_HOURS.invitation)}. If it expires, ask for a new one `
        + 'with "Forgotten your password?" on the sign-in page.',
    },
  ])
}
