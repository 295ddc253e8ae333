// Turns a case and the walk done with its caller into the hand-off notice and the caller's
// summary, from the walk's own record so the words match what the runner showed.
import type { FindingStep, GuideContent } from '../../../src/shared/guides/schema';
import type { WalkDetail, WalkSummary } from '../../../src/shared/schemas/walks';
import { handoffMail } from '../mail/templates/case-handoff';
import { caseSummaryMail, type SummaryResult } from '../mail/templates/case-summary';
import type { MailContent } from '../mail/templates/layout';
import { CASE_PRIORITY_LABELS } from '../../../src/shared/schemas/cases';
import type { CaseRecord } from './cases.repository';

export interface WalkRecordForMail {
  summary: WalkSummary;
  detail: WalkDetail;
}

export function placeWords(c: Pick<CaseRecord, 'site' | 'line' | 'applicator'>): string | null {
  const parts = [c.site, c.line, c.applicator && `valve ${c.applicator}`].filter(Boolean);
  return parts.length ? parts.join(', ') : null;
}

export function callerWords(c: Pick<CaseRecord, 'callerName' | 'callerCompany'>): string {
  if (c.callerName && c.callerCompany) return `${c.callerName} (${c.callerCompany})`;
  return c.callerName ?? c.callerCompany ?? 'Unknown caller';
}

function findingStep(content: GuideContent, stepId: string | null): FindingStep | null {
  const step = content.steps.find((s) => s.id === stepId);
  return step?.kind === 'finding' ? step : null;
}

/** How the walk ended, in a sentence for a colleague. */
export function walkResultWords(w: WalkRecordForMail): string {
  const { summary, detail } = w;
  const last = summary.steps.at(-1);
  if (summary.status === 'open') return `Still open, at “${last?.title ?? 'the start'}”.`;
  if (summary.status === 'abandoned') return `Stopped at “${last?.title ?? 'the start'}”${summary.outcomeNote ? `: ${summary.outcomeNote}` : '.'}`;
  if (summary.ended === 'handoff') return `Ended at the Hand-off “${last?.title ?? ''}”: the guide sends this case to a person.`;
  if (summary.ended === 'fixed-by-try') return `Fixed by “${last?.title ?? ''}”.`;
  const finding = findingStep(detail.guide.content, detail.state.at);
  const outcome = summary.outcomeLabel ? `; ${summary.outcomeLabel.toLowerCase()}` : '';
  return `Reached the finding “${finding?.title ?? last?.title ?? ''}”${outcome}.`;
}

function summaryResult(w: WalkRecordForMail, followUp: string | null): SummaryResult {
  const { summary, detail } = w;
  if (summary.status === 'open') return { kind: 'open' };
  if (summary.status === 'abandoned') return { kind: 'abandoned' };
  if (summary.ended === 'handoff') return { kind: 'handoff', followUp };
  if (summary.ended === 'fixed-by-try') return { kind: 'fixed-by-try', title: summary.steps.at(-1)?.title ?? '' };
  const finding = findingStep(detail.guide.content, detail.state.at);
  if (!finding) return { kind: 'open' };
  return {
    kind: 'finding',
    title: finding.title,
    cause: finding.cause,
    remedy: finding.remedy,
    parts: finding.parts.map((p) => ({ name: p.name, partNumber: p.partNumber ?? null, quantity: p.quantity })),
    outcome: summary.outcome,
    outcomeNote: summary.outcomeNote,
  };
}

export function summaryMail(input: { organisationName: string; supportName: string; kase: CaseRecord; note: string | null; walk: WalkRecordForMail | null }): MailContent {
  const { kase, walk } = input;
  const followUp = kase.status === 'handed-off' && kase.assignee ? kase.assignee.name : null;
  let walkPart = null;
  if (walk) {
    const seen = new Set<string>();
    const cautions: { text: string; action: string }[] = [];
    for (const step of walk.summary.steps) {
      for (const c of step.cautions) {
        if (seen.has(c.text)) continue;
        seen.add(c.text);
        cautions.push({ text: c.text, action: c.action });
      }
    }
    walkPart = {
      guideTitle: walk.summary.guideTitle,
      steps: walk.summary.steps.filter((s) => s.kind !== 'finding' && s.kind !== 'handoff').map((s) => ({ title: s.title, answer: s.answer })),
      result: summaryResult(walk, followUp),
      cautions,
    };
  }
  return caseSummaryMail({
    organisationName: input.organisationName,
    caseId: kase.id,
    callerName: kase.callerName,
    symptom: kase.symptom,
    place: placeWords(kase),
    supportName: input.supportName,
    note: input.note,
    walk: walkPart,
  });
}

export function handoffNotice(input: {
  organisationName: string;
  assigneeName: string;
  fromName: string;
  kase: CaseRecord;
  note: string;
  origin: string;
  walk: WalkRecordForMail | null;
}): MailContent {
  const { kase, walk } = input;
  const contact = [kase.callerPhone, kase.callerEmail].filter(Boolean).join(', ');
  return handoffMail({
    organisationName: input.organisationName,
    assigneeName: input.assigneeName,
    fromName: input.fromName,
    caseId: kase.id,
    caseLink: `${input.origin}/cases/${kase.id}`,
    symptom: kase.symptom,
    priority: CASE_PRIORITY_LABELS[kase.priority],
    caller: callerWords(kase),
    callerContact: contact || null,
    place: placeWords(kase),
    note: input.note,
    walk: walk
      ? {
          guideTitle: walk.summary.guideTitle,
          result: walkResultWords(walk),
          text: walk.summary.handoffText ?? walk.summary.text,
          link: `${input.origin}/walks/${walk.summary.walkId}/summary`,
        }
      : null,
  });
}
