import { hoursInWords, LINK_LIFETIME_HOURS } from '../../shared/utils/lifetimes'
import { renderMail } from './layout'

export function verificationMail(name: string, url: string) {
  return renderMail('Confirm your e-mail address for Tiltwright', name, [
    {
      paragraph:
        'Please confirm this e-mail address so that quotes, invoices and shipping notices '
        + 'reach you.',
    },
    { link: { label: 'Confirm my e-mail address', url } },
    {
      paragraph:
        'The link works once and expires in '
        + `${hoursInWords(LINK_LIFETIME_HOURS.confirmation)}. If you did not create a `
        + 'Tiltwright account, ignore this message.',
    },
  ])
}

export function passwordResetMail(name: string, url: string) {
  return renderMail('Reset your Tiltwright password', name, [
    {
      paragraph: 'Someone (hopefully you) asked to reset the password of this Tiltwright account.',
    },
    { link: { label: 'Choose a new password', url } },
    {
      paragraph:
        `The link works once and expires in ${hoursInWords(LINK_LIFETIME_HOURS.reset)}. `
        + 'If you did not ask for it, ignore this message; your password stays as it is.',
    },
  ])
}

export function passwordChangedMail(name: string) {
  return renderMail('Your Tiltwright password was changed', name, [
    {
      paragraph:
        'The password of your Tiltwright account was just changed. If this was not you, reset '
        + 'it at once from the sign-in page and tell your school\'s IT contact.',
    },
  ])
}

export function accountExistsMail(name: string, signInUrl: string, resetUrl: string) {
  return renderMail('You already have a Tiltwright account', name, [
    {
      paragraph:
        'Someone (hopefully you) tried to open a new Tiltwright account with this e-mail address. '
        + 'You already have one, so nothing was changed.',
    },
    { link: { label: 'Sign in', url: signInUrl } },
    {
      paragraph:
        `Forgotten your password? Ask for a reset link at ${resetUrl}. If this was not you, `
        + `ignore this message.`,
    },
  ])
}
