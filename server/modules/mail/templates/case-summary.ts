// The summary a caller receives after the call: what was checked with them, what was found, what
// to do, and the cautions that come with it.
import { render, type Block, type MailContent } from './layout';

export type SummaryResult =
  | {
      kind: 'finding';
      title: string;
      cause: string;
      remedy: string[];
      parts: { name: string; partNumber: string | null; quantity: number }[];
      outcome: 'fixed' | 'not-fixed' | 'fixed-by-other' | null;
      outcomeNote: string | null;
    }
  | { kind: 'fixed-by-try'; title: string }
  | { kind: 'handoff'; followUp: string | null }
  | { kind: 'open' }
  | { kind: 'abandoned' };

export interface SummaryMailInput {
  organisationName: string;
  caseId: number;
  callerName: string | null;
  symptom: string;
  place: string | null;
  supportName: string;
  note: string | null;
  walk: {
    guideTitle: string;
    steps: { title: string; answer: string | null }[];
    result: SummaryResult;
    cautions: { text: string; action: string }[];
  } | null;
}

/** Said with every message that asks someone to work on a valve. */
export const GENERAL_CAUTION = "Your site's rules, lockout procedure and the valve maker's manual come before this summary; work on the valve only if you are trained and allowed to.";

function resultBlocks(r: SummaryResult): Block[] {
  switch (r.kind) {
    case 'finding': {
      const blocks: Block[] = [
        { kind: 'heading', text: 'What we found' },
        { kind: 'p', text: `${r.title}. ${r.cause}` },
      ];
      if (r.outcome === 'fixed') blocks.push({ kind: 'p', text: 'You told us this fixed it.' });
      if (r.outcome === 'not-fixed') blocks.push({ kind: 'p', text: 'You told us this did not fix it yet; we will stay on it with you.' });
      if (r.outcome === 'fixed-by-other') blocks.push({ kind: 'p', text: `You told us something else fixed it${r.outcomeNote ? `: ${r.outcomeNote}` : '.'}` });
      blocks.push({ kind: 'heading', text: 'What to do' }, { kind: 'list', ordered: true, items: r.remedy });
      if (r.parts.length) {
        blocks.push({ kind: 'p', text: 'Parts:' }, { kind: 'list', items: r.parts.map((p) => `${p.name}${p.partNumber ? ` (${p.partNumber})` : ''} × ${p.quantity}`) });
      }
      return blocks;
    }
    case 'fixed-by-try':
      return [
        { kind: 'heading', text: 'What fixed it' },
        { kind: 'p', text: `${r.title}: you told us this fixed it.` },
      ];
    case 'handoff':
      return [
        { kind: 'heading', text: 'What happens next' },
        { kind: 'p', text: `The checks did not settle it on the call, so we passed your case to ${r.followUp ?? 'a senior technician'}, who will contact you.` },
      ];
    case 'open':
      return [
        { kind: 'heading', text: 'What happens next' },
        { kind: 'p', text: 'We have not finished the checks yet; we will contact you to go on.' },
      ];
    case 'abandoned':
      return [
        { kind: 'heading', text: 'What happens next' },
        { kind: 'p', text: 'We stopped the checks before the end; we will contact you to go on.' },
      ];
  }
}

export function caseSummaryMail(p: SummaryMailInput): MailContent {
  const where = p.place ? ` at ${p.place}` : '';
  const blocks: Block[] = [
    { kind: 'p', text: p.callerName ? `Hello ${p.callerName},` : 'Hello,' },
    { kind: 'p', text: `Thank you for calling the ${p.organisationName} support desk about “${p.symptom}”${where}. This is the written summary of case ${p.caseId}.` },
  ];
  if (p.note) blocks.push({ kind: 'p', text: p.note });
  if (p.walk) {
    if (p.walk.steps.length) {
      blocks.push({ kind: 'heading', text: 'What we checked with you' }, { kind: 'list', ordered: true, items: p.walk.steps.map((s) => (s.answer ? `${s.title}: ${s.answer}` : s.title)) });
    }
    const cautions = [...p.walk.cautions.map((c) => `${c.text} ${c.action}`.trim()), GENERAL_CAUTION];
    blocks.push({ kind: 'caution', title: 'Before anyone works on the valve', items: cautions });
    blocks.push(...resultBlocks(p.walk.result));
  } else {
    blocks.push({ kind: 'caution', title: 'Before anyone works on the valve', items: [GENERAL_CAUTION] });
  }
  blocks.push({ kind: 'small', text: `Case ${p.caseId}. Reply to this message or call us if anything is unclear.` });
  return render({
    subject: `Case ${p.caseId}: summary of your call about ${p.symptom.length > 70 ? `${p.symptom.slice(0, 69)}…` : p.symptom}`,
    organisationName: p.organisationName,
    preheader: 'What we checked, what we found and what to do.',
    blocks,
    footer: `${p.supportName}, ${p.organisationName} support desk`,
  });
}
