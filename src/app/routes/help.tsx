// Help: the keyboard shortcuts and what the step icons mean, in one place people can find from the footer.
import type { ReactNode } from 'react';
import { STEP_KINDS, type StepKind } from '@/shared/guides';
import { Card, PageHeader } from '@/components/ui/page';
import { StepKindIcon } from '@/features/walks/components/step-kind-icon';

const STEP_MEANINGS: Record<StepKind, { name: string; meaning: string }> = {
  ask: { name: 'Ask', meaning: 'A question about what you see; your answer picks the next step.' },
  measure: { name: 'Measure', meaning: 'Take a reading (a calculator may work it out); the value decides where the walk goes.' },
  try: { name: 'Try', meaning: 'Do one thing, then say whether it fixed the problem.' },
  finding: { name: 'Finding', meaning: 'The end of a walk: the likely cause and what to do about it.' },
  handoff: { name: 'Hand-off', meaning: 'The end of a walk: pass the job to someone else, with what you found so far.' },
};

function Keys({ children }: { children: ReactNode }) {
  return <kbd className="rounded border border-rule-strong bg-paper px-1.5 py-0.5 font-mono text-sm">{children}</kbd>;
}

function ShortcutTable({ caption, rows }: { caption: string; rows: [ReactNode, string][] }) {
  return (
    <table className="w-full text-left">
      <caption className="mb-2 text-left text-lg font-semibold">{caption}</caption>
      <thead className="sr-only">
        <tr>
          <th scope="col">Keys</th>
          <th scope="col">What they do</th>
        </tr>
      </thead>
      <tbody>
        {rows.map(([keys, what], i) => (
          <tr key={i} className="border-t border-rule align-top">
            <td className="whitespace-nowrap py-2 pr-4">{keys}</td>
            <td className="py-2">{what}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function HelpPage() {
  return (
    <div className="space-y-6">
      <PageHeader title="Help" lead="Keyboard shortcuts for people at a desk, and what the step icons on a walk mean." />
      <Card>
        <ShortcutTable caption="Anywhere" rows={[[<Keys>/</Keys>, 'Jump to the search box in the header (not while you are typing in a field).']]} />
      </Card>
      <Card>
        <ShortcutTable
          caption="Guide editor outline"
          rows={[
            [<Keys>Tab</Keys>, 'Add a next step under the selected one.'],
            [<Keys>Enter</Keys>, 'Add a step beside the selected one.'],
            [
              <span className="flex flex-wrap gap-1">
                <Keys>A</Keys> <Keys>M</Keys> <Keys>T</Keys> <Keys>F</Keys> <Keys>H</Keys>
              </span>,
              'Make the step an Ask, Measure, Try, Finding or Hand-off.',
            ],
            [
              <span>
                <Keys>Alt</Keys> + <Keys>↑</Keys> / <Keys>↓</Keys>
              </span>,
              'Move the step up or down among its siblings.',
            ],
            [
              <span>
                <Keys>↑</Keys> <Keys>↓</Keys>
              </span>,
              'Go to the step above or below.',
            ],
            [
              <span>
                <Keys>←</Keys> <Keys>→</Keys>
              </span>,
              'Fold or unfold the steps under it.',
            ],
            [<Keys>Delete</Keys>, 'Remove the step (you are asked first).'],
            [
              <span>
                <Keys>Ctrl</Keys> + <Keys>Z</Keys>
              </span>,
              'Undo (outside a text field).',
            ],
            [
              <span>
                <Keys>Ctrl</Keys> + <Keys>Shift</Keys> + <Keys>Z</Keys>
              </span>,
              'Redo (outside a text field).',
            ],
          ]}
        />
        <p className="mt-2 text-sm text-ink-soft">On a Mac, Cmd works where Ctrl is written.</p>
      </Card>
      <Card>
        <h2 className="mb-2 text-lg font-semibold">Step icons</h2>
        <ul className="space-y-2">
          {STEP_KINDS.map((kind) => (
            <li key={kind} className="flex items-start gap-3">
              <span className="mt-0.5 inline-flex h-8 w-8 shrink-0 items-center justify-center rounded-full border border-rule-strong text-amber-deep">
                <StepKindIcon kind={kind} />
              </span>
              <span>
                <strong>{STEP_MEANINGS[kind].name}</strong> — {STEP_MEANINGS[kind].meaning}
              </span>
            </li>
          ))}
        </ul>
      </Card>
      <Card>
        <h2 className="mb-2 text-lg font-semibold">No signal</h2>
        <p>
          Once Beadpath has been opened on a phone, it opens again without a connection. Guides and articles you have already read stay readable, and a walk keeps your answers on the phone and sends
          them when the signal returns. Saving guides, articles and cases needs a connection.
        </p>
      </Card>
    </div>
  );
}
