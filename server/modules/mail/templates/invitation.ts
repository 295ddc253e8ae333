// The invitation: a one-time link to set a password and join the organisation.
import { render, type MailContent } from './layout';

export function invitationMail(p: { organisationName: string; name: string; email: string; invitedBy: string | null; roles: string[]; link: string; days: number }): MailContent {
  const who = p.invitedBy ? `${p.invitedBy} has` : 'Your admin has';
  return render({
    subject: `Your Beadpath account at ${p.organisationName}`,
    organisationName: p.organisationName,
    preheader: 'Set your password to start using Beadpath.',
    blocks: [
      { kind: 'p', text: `Hello ${p.name},` },
      {
        kind: 'p',
        text: `${who} made a Beadpath account for you at ${p.organisationName}${p.roles.length ? ` (${p.roles.join(', ')})` : ''}. Beadpath holds the organisation's troubleshooting guides, calculators and service records for dispensing valves.`,
      },
      { kind: 'button', label: 'Set my password', href: p.link },
      { kind: 'small', text: `The link works once, for ${p.days} days. You will sign in with ${p.email}. If you did not expect this message, ignore it and nothing happens.` },
    ],
    footer: `Sent by Beadpath for ${p.organisationName}. This mailbox is not read.`,
  });
}
