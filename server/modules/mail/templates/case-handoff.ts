// Hand-off notice: the support desk passes a case to an author or senior technician, with the
// walk done with the caller so they need not ask again.
import { render, type Block, type MailContent } from './layout';

export interface HandoffMailInput {
  organisationName: string;
  assigneeName: string;
  fromName: string;
  caseId: number;
  caseLink: string;
  symptom: string;
  priority: string;
  caller: string;
  callerContact: string | null;
  place: string | null;
  note: string;
  walk: { guideTitle: string; result: string; text: string; link: string } | null;
}

export function handoffMail(p: HandoffMailInput): MailContent {
  const facts = [
    `Caller: ${p.caller}`,
    ...(p.callerContact ? [`Contact: ${p.callerContact}`] : []),
    ...(p.place ? [`Where: ${p.place}`] : []),
    `What they see: ${p.symptom}`,
    `Priority: ${p.priority}`,
  ];
  const blocks: Block[] = [
    { kind: 'p', text: `Hello ${p.assigneeName},` },
    { kind: 'p', text: `${p.fromName} on the support desk handed case ${p.caseId} to you.` },
    { kind: 'heading', text: 'The call' },
    { kind: 'list', items: facts },
    { kind: 'heading', text: `Note from ${p.fromName}` },
    { kind: 'p', text: p.note },
  ];
  if (p.walk) {
    blocks.push(
      { kind: 'heading', text: `Walked with the caller: ${p.walk.guideTitle}` },
      { kind: 'p', text: p.walk.result },
      { kind: 'pre', text: p.walk.text },
      { kind: 'small', text: `The walk's record: ${p.walk.link}` },
    );
  }
  blocks.push({ kind: 'button', label: 'Open the case', href: p.caseLink });
  return render({
    subject: `Case ${p.caseId} handed to you: ${p.symptom.length > 80 ? `${p.symptom.slice(0, 79)}…` : p.symptom}`,
    organisationName: p.organisationName,
    preheader: `${p.fromName} handed you a case from the support desk.`,
    blocks,
    footer: `Sent by Beadpath for ${p.organisationName}. You also find this case under Cases when you sign in.`,
  });
}
