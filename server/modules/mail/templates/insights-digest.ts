// The weekly digest for managers: services due in the coming 7 and 30 days (applicator, site and
// line, part, due date) and the repeat failures of the last 30 days, each with a link into Beadpath.
import { render, type Block, type MailContent } from './layout';

export interface DigestService {
  tag: string;
  site: string;
  line: string;
  part: string;
  dueOn: string;
  overdue: boolean;
  link: string;
}

export interface DigestRepeat {
  tag: string;
  cause: string;
  times: number;
  lastOn: string;
  link: string;
}

export interface DigestMailInput {
  organisationName: string;
  recipientName: string;
  weekOf: string;
  today: string;
  dueIn7: DigestService[];
  dueIn30: DigestService[];
  repeats: DigestRepeat[];
  /** More services than listed. */
  moreServices: number;
  forecastLink: string;
  causesLink: string;
  settingsLink: string;
  preview: boolean;
}

const PART_WORDS: Record<string, string> = { seat: 'seat', needle: 'needle', seals: 'dynamic seals' };

function serviceLine(s: DigestService): string {
  return `${s.tag} (${s.site} / ${s.line}): ${PART_WORDS[s.part] ?? s.part} ${s.overdue ? 'overdue, due now' : `due ${s.dueOn}`} - ${s.link}`;
}

export function insightsDigestMail(p: DigestMailInput): MailContent {
  const blocks: Block[] = [
    { kind: 'p', text: `Hello ${p.recipientName},` },
    {
      kind: 'p',
      text: `Here is the week starting ${p.weekOf} for ${p.organisationName}: the seat, needle and seal services coming up, from each valve's counter and rate, and the failures that came back within 30 days.`,
    },
    { kind: 'heading', text: `Due in the next 7 days (${p.dueIn7.length})` },
    p.dueIn7.length ? { kind: 'list', items: p.dueIn7.map(serviceLine) } : { kind: 'p', text: 'Nothing is due in the next 7 days.' },
    { kind: 'heading', text: `Due in 8 to 30 days (${p.dueIn30.length})` },
    p.dueIn30.length ? { kind: 'list', items: p.dueIn30.map(serviceLine) } : { kind: 'p', text: 'Nothing else is due in the next 30 days.' },
  ];
  if (p.moreServices > 0)
    blocks.push({ kind: 'small', text: `${p.moreServices} more services are due in the next 30 days; the full list, the parts to order and a calendar are on the forecast page.` });
  blocks.push({ kind: 'button', label: 'Open the service forecast', href: p.forecastLink });
  blocks.push({ kind: 'heading', text: 'Repeat failures, last 30 days' });
  blocks.push(
    p.repeats.length
      ? { kind: 'list', items: p.repeats.map((r) => `${r.tag}: ${r.cause}, ${r.times + 1} times (last on ${r.lastOn}) - ${r.link}`) }
      : { kind: 'p', text: 'No cause came back on the same applicator within 30 days.' },
  );
  blocks.push({ kind: 'small', text: `A repeat is the same cause on the same applicator again within 30 days: often a sign the first fix treated the symptom. Recurring causes: ${p.causesLink}` });
  blocks.push({
    kind: 'caution',
    title: 'Before opening a valve',
    items: [
      'Shut off and lock out the fluid supply, the air and the electrical supply, and release the pressure in the line and the valve.',
      'Let heated valves and hoses cool, and wear the gloves and eye protection the fluid’s safety data sheet asks for.',
      'Follow your site rules, local codes and the valve maker’s manual; they come before anything in this message.',
    ],
  });
  return render({
    subject: `${p.preview ? '[Preview] ' : ''}Services due and repeat failures, week of ${p.weekOf}`,
    organisationName: p.organisationName,
    preheader: `${p.dueIn7.length} due this week, ${p.dueIn30.length} more within 30 days, ${p.repeats.length} repeat failures.`,
    blocks,
    footer: `Sent by Beadpath for ${p.organisationName} every Monday at 06:00 UTC to managers. Figures as of ${p.today}. To stop receiving it, switch it off on the forecast page under Insights: ${p.settingsLink}`,
  });
}
