// Password reset: a one-time link that works for an hour.
import { render, type MailContent } from './layout';

export function passwordResetMail(p: { organisationName: string; name: string; email: string; link: string; minutes: number }): MailContent {
  return render({
    subject: 'Reset your Beadpath password',
    organisationName: p.organisationName,
    preheader: `A link to choose a new password, valid for ${p.minutes} minutes.`,
    blocks: [
      { kind: 'p', text: `Hello ${p.name},` },
      { kind: 'p', text: `Someone asked to reset the password of the Beadpath account ${p.email} at ${p.organisationName}.` },
      { kind: 'button', label: 'Choose a new password', href: p.link },
      {
        kind: 'small',
        text: `The link works once, for ${p.minutes} minutes; choosing a new password signs you out everywhere else. If you did not ask for this, ignore this message: your password stays as it is.`,
      },
    ],
    footer: `Sent by Beadpath for ${p.organisationName}. This mailbox is not read.`,
  });
}
