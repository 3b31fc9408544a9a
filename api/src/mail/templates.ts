import type { OutgoingMail } from './mailer'

export function inviteMail(to: string, name: string, link: string, hours: number): OutgoingMail {
  return {
    to,
    subject: 'You have been invited to Backsight',
    text: [
      `Hello ${name},`,
      '',
      'An administrator has created a Backsight account for you.',
      'Choose your password here (the link works once):',
      '',
      link,
      '',
      `The link expires in ${hours} hours. If it has expired, ask your administrator to send a new one.`,
    ].join('\n'),
  }
}

export function resetMail(to: string, name: string, link: string, minutes: number): OutgoingMail {
  return {
    to,
    subject: 'Reset your Backsight password',
    text: [
      `Hello ${name},`,
      '',
      'Someone asked to reset the password of your Backsight account. If it was you, choose a new password here:',
      '',
      link,
      '',
      `The link works once and expires in ${minutes} minutes. If you did not ask for this, ignore this message; your password is unchanged.`,
    ].join('\n'),
  }
}
