// The printable record of a walk: its path in words, readings with their bands and calculator
// values, cautions acknowledged, notes, outcome, and the plain text a technician sends at a Hand-off.
import { getCalculator } from '../../../src/shared/calculators';
import { STEP_KIND_LABELS, type GuideContent, type MeasureStep, type Step } from '../../../src/shared/guides/schema';
import type { WalkSummary, WalkSummaryStep } from '../../../src/shared/schemas/walks';
import { formatNumber, unitLabel } from '../../../src/shared/units';
import type { FindingOutcome, ReadingAnswer, RoutingAnswer, WalkAnswer } from '../../../src/shared/walks/answers';
import type { Route, WalkState } from '../../../src/shared/walks/walk-path';
import type { NoteRecord, WalkRecord } from './walks.repository';

export const OUTCOME_LABELS: Record<FindingOutcome, string> = {
  fixed: 'Fixed',
  'not-fixed': 'Not fixed',
  'fixed-by-other': 'Fixed by something else',
};

function quantity(value: number, unit: string): string {
  let label = unit;
  try {
    label = unitLabel(unit);
  } catch {
    // A unit the table does not know is shown as spelled.
  }
  return `${formatNumber(value)} ${label}`.trim();
}

/** Dates in messages a person pastes elsewhere: unambiguous, minute precision. */
export function shownTime(iso: string | null | undefined): string {
  if (!iso) return '';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

function readingDetail(step: MeasureStep, answer: ReadingAnswer, route: Route | undefined): NonNullable<WalkSummaryStep['reading']> {
  const band = route?.bandId ? step.bands.find((b) => b.id === route.bandId) : undefined;
  const calc = step.calculator;
  const declaration = calc ? getCalculator(calc.id) : undefined;
  return {
    value: answer.value,
    unit: answer.unit,
    routedValue: route?.routedValue ?? null,
    bandId: band?.id ?? null,
    bandLabel: band?.label ?? null,
    calculator: calc
      ? {
          id: calc.id,
          title: declaration?.title ?? calc.id,
          output: calc.output,
          outputLabel: declaration?.outputs.find((o) => o.name === calc.output)?.label ?? calc.output,
          computed: route?.computed ?? null,
          inputs: { ...calc.fixedInputs, ...(answer.calculatorInputs ?? {}) },
        }
      : null,
  };
}

function readingWords(step: MeasureStep, answer: ReadingAnswer, reading: NonNullable<WalkSummaryStep['reading']>): string {
  let words = quantity(answer.value, answer.unit);
  const calc = reading.calculator;
  if (calc?.computed) {
    const given = Object.entries(answer.calculatorInputs ?? {})
      .map(([name, value]) => {
        const label = getCalculator(calc.id)?.inputs.find((i) => i.name === name)?.label ?? name;
        return `${label.toLowerCase()} ${typeof value === 'string' ? value : quantity(value.value, value.unit)}`;
      })
      .join(', ');
    words += `; ${calc.title}${given ? ` with ${given}` : ''}: ${calc.outputLabel.toLowerCase()} ${quantity(calc.computed.value, calc.computed.unit)}`;
  } else if (reading.routedValue && reading.routedValue.unit !== answer.unit) {
    words += ` (${quantity(reading.routedValue.value, reading.routedValue.unit)})`;
  }
  if (reading.bandLabel) words += ` → ${reading.bandLabel}`;
  return step.reading.label ? `${step.reading.label}: ${words}` : words;
}

function answerWords(step: Step, answer: RoutingAnswer | undefined, causeLabel: (code: string) => string): string | null {
  if (step.kind === 'handoff') return `Hand-off: call ${step.contact}`;
  if (!answer) return null;
  switch (answer.kind) {
    case 'choice':
      return step.kind === 'ask' ? (step.choices.find((c) => c.id === answer.choiceId)?.label ?? answer.choiceId) : answer.choiceId;
    case 'try':
      return answer.fixed ? 'Fixed' : 'Not fixed';
    case 'finding-outcome': {
      let words = OUTCOME_LABELS[answer.outcome];
      if (answer.causeCode) words += ` (cause: ${causeLabel(answer.causeCode)})`;
      if (answer.note?.trim()) words += `: ${answer.note.trim()}`;
      return words;
    }
    case 'reading':
      return quantity(answer.value, answer.unit);
  }
}

export function buildSummary(input: {
  walk: WalkRecord;
  guide: { title: string; symptom: string; number: number; content: GuideContent };
  log: WalkAnswer[];
  state: WalkState;
  notes: NoteRecord[];
  causeLabel: (code: string) => string;
}): WalkSummary {
  const { walk, guide, log, state, notes, causeLabel } = input;
  const byId = new Map(guide.content.steps.map((s) => [s.id, s]));

  // The first acknowledgement of each caution counts: the caution was read from then on.
  const acknowledgedAt = new Map<string, string>();
  for (const entry of log) {
    if (entry.kind !== 'acknowledge') continue;
    for (const id of entry.cautionIds) {
      const key = `${entry.stepId}\u0000${id}`;
      if (!acknowledgedAt.has(key)) acknowledgedAt.set(key, entry.answeredAt);
    }
  }

  const steps: WalkSummaryStep[] = [];
  state.path.forEach((entry, index) => {
    const step = byId.get(entry.stepId);
    if (!step) return;
    const reading = step.kind === 'measure' && entry.answer?.kind === 'reading' ? readingDetail(step, entry.answer, entry.route) : undefined;
    const answer = reading && step.kind === 'measure' && entry.answer?.kind === 'reading' ? readingWords(step, entry.answer, reading) : answerWords(step, entry.answer, causeLabel);
    steps.push({
      position: index + 1,
      stepId: step.id,
      title: step.title,
      kind: step.kind,
      kindLabel: STEP_KIND_LABELS[step.kind],
      answer,
      answeredAt: entry.answer?.answeredAt ?? null,
      ...(reading ? { reading } : {}),
      cautions: step.cautions.map((c) => ({
        id: c.id,
        hazard: c.hazard,
        text: c.text,
        action: c.action,
        acknowledgedAt: acknowledgedAt.get(`${step.id}\u0000${c.id}`) ?? null,
      })),
      notes: notes.filter((n) => n.stepId === step.id).map((n) => ({ text: n.text, fileIds: n.fileIds, createdAt: n.createdAt })),
    });
  });

  const summary: WalkSummary = {
    walkId: walk.id,
    guideId: walk.guideId,
    guideTitle: guide.title,
    symptom: guide.symptom,
    versionNumber: guide.number,
    technician: walk.userName,
    site: walk.site,
    line: walk.line,
    applicator: walk.applicator,
    status: walk.status,
    endKind: walk.endKind,
    ended: state.ended,
    outcome: walk.outcome,
    outcomeLabel: walk.outcome ? OUTCOME_LABELS[walk.outcome] : null,
    outcomeNote: walk.outcomeNote,
    causeCode: walk.causeCode,
    causeLabel: walk.causeCode ? causeLabel(walk.causeCode) : null,
    startedAt: walk.startedAt,
    endedAt: walk.endedAt,
    steps,
    handoffText: null,
    text: '',
  };

  const last = state.at ? byId.get(state.at) : undefined;
  if (state.ended === 'handoff' && last?.kind === 'handoff') summary.handoffText = handoffText(summary, last.contact, last.message);
  summary.text = recordText(summary);
  return summary;
}

function placeLine(s: WalkSummary): string {
  return [s.site && `Site: ${s.site}`, s.line && `Line: ${s.line}`, s.applicator && `Applicator: ${s.applicator}`].filter(Boolean).join('; ');
}

function pathLines(s: WalkSummary): string[] {
  return s.steps.map((step) => {
    const answer = step.answer ?? (s.status === 'abandoned' ? 'not answered: the walk was stopped here' : 'not answered yet');
    return `${step.position}. ${step.title} (${step.kindLabel}): ${answer}`;
  });
}

function noteLines(s: WalkSummary): string[] {
  return s.steps.flatMap((step) => step.notes.map((n) => `- ${step.title}: ${n.text || '(photo)'}${n.fileIds.length ? ` [${n.fileIds.length} photo${n.fileIds.length === 1 ? '' : 's'}]` : ''}`));
}

function handoffText(s: WalkSummary, contact: string, message: string): string {
  const lines = [
    `Hand-off from walk #${s.walkId}: ${s.guideTitle} (version ${s.versionNumber})`,
    `Symptom: ${s.symptom}`,
    `Call: ${contact}`,
    `What to tell them: ${message}`,
    '',
    `Technician: ${s.technician ?? 'unknown'}`,
  ];
  const place = placeLine(s);
  if (place) lines.push(place);
  lines.push(`Started: ${shownTime(s.startedAt)}`, '', 'Path so far:', ...pathLines(s));
  const notes = noteLines(s);
  if (notes.length) lines.push('', 'Notes:', ...notes);
  return lines.join('\n');
}

function recordText(s: WalkSummary): string {
  const lines = [`Walk #${s.walkId}: ${s.guideTitle} (version ${s.versionNumber})`, `Symptom: ${s.symptom}`, `Technician: ${s.technician ?? 'unknown'}`];
  const place = placeLine(s);
  if (place) lines.push(place);
  lines.push(`Started: ${shownTime(s.startedAt)}${s.endedAt ? `; ended: ${shownTime(s.endedAt)}` : ''}`);
  lines.push(`Status: ${s.status}${s.outcomeLabel ? `; outcome: ${s.outcomeLabel}` : ''}${s.causeLabel ? `; cause: ${s.causeLabel}` : ''}`);
  if (s.outcomeNote) lines.push(`${s.status === 'abandoned' ? 'Reason' : 'What was done'}: ${s.outcomeNote}`);
  lines.push('', 'Path:', ...pathLines(s));
  const cautions = s.steps.flatMap((step) => step.cautions.filter((c) => c.acknowledgedAt).map((c) => `- ${step.title}: ${c.text} (acknowledged ${shownTime(c.acknowledgedAt)})`));
  if (cautions.length) lines.push('', 'Cautions acknowledged:', ...cautions);
  const notes = noteLines(s);
  if (notes.length) lines.push('', 'Notes:', ...notes);
  return lines.join('\n');
}
