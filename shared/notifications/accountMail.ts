// The text of account e-mails (invitation and password reset) and of a route's test mail. Pure.
import { ADVISORY_CAUTION } from '../alarms/vocabulary'

export type PasswordLinkPurpose = 'invite' | 'reset'

export function passwordLinkMail(input: { purpose: PasswordLinkPurpose, name: string, link: string, expiresInHours: number }) {
  const invite = input.purpose === 'invite'
  const subject = invite ? 'Brinkline: set your password' : 'Brinkline: choose a new password'
  const lines = [
    `Hello ${input.name},`,
    '',
    invite
      ? 'An administrator has opened a Brinkline account for you. Choose your password here:'
      : 'An administrator has asked for your Brinkline password to be reset. Choose a new one here:',
    '',
    input.link,
    '',
    `The link works once and expires in ${input.expiresInHours} ${input.expiresInHours === 1 ? 'hour' : 'hours'}.`,
    'If you did not expect this message, tell your administrator and do not use the link.',
    '',
    ADVISORY_CAUTION,
  ]
  return { subject, text: lines.join('\n') }
}

export function routeTestMail(input: { routeName: string, siteName: string, sentBy: string }) {
  return {
    subject: `Brinkline: test message for route "${input.routeName}"`,
    text: [
      `This is a test message of the notification route "${input.routeName}" (${input.siteName}), sent by ${input.sentBy}.`,
      'If you received it, alarm mail of this route reaches you. No alarm has been raised.',
      '',
      ADVISORY_CAUTION,
    ].join('\n'),
  }
}
