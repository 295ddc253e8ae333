// The case page's dialogs: hand-off to an author or senior technician, the caller's summary with
// its preview, and editing the call's details.
import { useEffect, useState, type FormEvent } from 'react';
import { CASE_PRIORITIES, CASE_PRIORITY_LABELS, CaseHandoffInput, CasePatchInput, type CaseDetail } from '@/shared/schemas/cases';
import { errorMessage } from '@/lib/api-client';
import { clientFieldErrors, serverFieldErrors } from '@/lib/form-errors';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { SelectField, TextField, inputClass } from '@/components/ui/field';
import { useCasePeople, useHandoff, useSendSummary, useSummaryPreview, useUpdateCase } from '../api/cases';

function walkLabel(w: CaseDetail['walks'][number]): string {
  const end = w.status === 'open' ? 'still open' : w.status === 'abandoned' ? 'stopped' : w.endKind === 'handoff' ? 'ended at a hand-off' : w.outcome === 'not-fixed' ? 'not fixed' : 'fixed';
  return `${w.guideTitle} (${end})`;
}

export function HandoffDialog({ kase, open, onClose }: { kase: CaseDetail; open: boolean; onClose: () => void }) {
  const people = useCasePeople();
  const handoff = useHandoff(kase.id);
  const lastWalk = kase.walks.at(-1)?.id ?? null;
  const [assigneeId, setAssigneeId] = useState('');
  const [walkId, setWalkId] = useState(lastWalk ? String(lastWalk) : '');
  const [note, setNote] = useState('');
  const [fields, setFields] = useState<Record<string, string>>({});
  useEffect(() => setWalkId(lastWalk ? String(lastWalk) : ''), [lastWalk]);

  function submit(e: FormEvent) {
    e.preventDefault();
    const body = { assigneeId: Number(assigneeId) || undefined, walkId: walkId ? Number(walkId) : null, note };
    const errs = clientFieldErrors(CaseHandoffInput, body);
    if (errs?.assigneeId) errs.assigneeId = 'Pick the person who takes the case';
    setFields(errs ?? {});
    if (errs) return;
    handoff.mutate(
      { assigneeId: Number(assigneeId), walkId: body.walkId, note },
      {
        onSuccess: (c) => {
          showToast(`Handed to ${c.assignee?.name ?? 'them'}; they get an e-mail and a notice`, 'ok');
          setNote('');
          onClose();
        },
        onError: (err) => setFields(serverFieldErrors(err)),
      },
    );
  }

  const takers = (people.data ?? []).filter((p) => p.takesHandoffs);
  return (
    <Dialog open={open} title="Hand off the case" onClose={onClose}>
      <form onSubmit={submit} noValidate className="space-y-4">
        <p className="text-ink-soft">The person gets an e-mail with the call and the walk, and a notice when they sign in.</p>
        {handoff.isError && !Object.keys(fields).length ? <Notice tone="error" title={errorMessage(handoff.error)} /> : null}
        <SelectField label="Hand to" value={assigneeId} onChange={(e) => setAssigneeId(e.target.value)} error={fields.assigneeId}>
          <option value="">Choose an author or senior technician</option>
          {takers.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name} ({p.roles.filter((r) => r === 'author' || r === 'technician').join(', ')})
            </option>
          ))}
        </SelectField>
        {kase.walks.length ? (
          <SelectField label="Walk to attach" value={walkId} onChange={(e) => setWalkId(e.target.value)} error={fields.walkId}>
            <option value="">No walk</option>
            {kase.walks.map((w) => (
              <option key={w.id} value={w.id}>
                {walkLabel(w)}
              </option>
            ))}
          </SelectField>
        ) : null}
        <div>
          <label htmlFor="handoff-note" className="mb-1 block text-sm font-semibold">
            What should they know?
          </label>
          <textarea
            id="handoff-note"
            rows={4}
            className={inputClass}
            value={note}
            onChange={(e) => setNote(e.target.value)}
            aria-invalid={fields.note ? true : undefined}
            placeholder="What the caller tried, readings, when to call back"
          />
          {fields.note ? <p className="mt-1 text-sm font-semibold text-danger">{fields.note}</p> : null}
        </div>
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={handoff.isPending}>
            Hand off
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

export function SummaryDialog({ kase, open, onClose }: { kase: CaseDetail; open: boolean; onClose: () => void }) {
  const ended = kase.walks.filter((w) => w.status === 'ended');
  const defaultWalk = (ended.at(-1) ?? kase.walks.at(-1))?.id ?? null;
  const [walkId, setWalkId] = useState<number | null>(defaultWalk);
  const [to, setTo] = useState(kase.callerEmail ?? '');
  const [note, setNote] = useState('');
  const [fields, setFields] = useState<Record<string, string>>({});
  const preview = useSummaryPreview(kase.id, walkId, open);
  const send = useSendSummary(kase.id);
  useEffect(() => setWalkId(defaultWalk), [defaultWalk]);

  function submit(e: FormEvent) {
    e.preventDefault();
    send.mutate(
      { walkId, to, note },
      {
        onSuccess: () => {
          showToast(`Summary on its way to ${to}`, 'ok');
          setNote('');
          setFields({});
          onClose();
        },
        onError: (err) => setFields(serverFieldErrors(err)),
      },
    );
  }

  return (
    <Dialog open={open} title="Send the caller a summary" onClose={onClose}>
      <form onSubmit={submit} noValidate className="space-y-4">
        {send.isError && !Object.keys(fields).length ? <Notice tone="error" title={errorMessage(send.error)} /> : null}
        <TextField label="To" type="email" value={to} onChange={(e) => setTo(e.target.value)} error={fields.to} autoComplete="off" />
        {kase.walks.length > 1 ? (
          <SelectField label="Walk to summarise" value={walkId ?? ''} onChange={(e) => setWalkId(e.target.value ? Number(e.target.value) : null)} error={fields.walkId}>
            {kase.walks.map((w) => (
              <option key={w.id} value={w.id}>
                {walkLabel(w)}
              </option>
            ))}
          </SelectField>
        ) : null}
        <div>
          <label htmlFor="summary-note" className="mb-1 block text-sm font-semibold">
            A line of your own (optional)
          </label>
          <textarea id="summary-note" rows={2} className={inputClass} value={note} onChange={(e) => setNote(e.target.value)} placeholder="Thanks for your time on the phone…" />
          {fields.note ? <p className="mt-1 text-sm font-semibold text-danger">{fields.note}</p> : null}
        </div>
        <details open className="rounded-md border border-rule bg-paper p-2">
          <summary className="min-h-11 cursor-pointer content-center font-semibold">What the caller receives</summary>
          {preview.isPending ? (
            <LoadingBlock label="Preparing the summary" />
          ) : preview.isError ? (
            <Notice tone="error" title={errorMessage(preview.error)} />
          ) : (
            <div>
              <p className="text-sm font-semibold">{preview.data.subject}</p>
              <pre className="mt-2 max-h-72 overflow-auto whitespace-pre-wrap font-sans text-sm">{preview.data.text}</pre>
            </div>
          )}
        </details>
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={send.isPending}>
            Send the summary
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

export function EditCaseDialog({ kase, open, onClose }: { kase: CaseDetail; open: boolean; onClose: () => void }) {
  const update = useUpdateCase(kase.id);
  const people = useCasePeople();
  const initial = () => ({
    callerName: kase.callerName ?? '',
    callerCompany: kase.callerCompany ?? '',
    callerPhone: kase.callerPhone ?? '',
    callerEmail: kase.callerEmail ?? '',
    site: kase.site ?? '',
    line: kase.line ?? '',
    applicator: kase.applicator ?? '',
    symptom: kase.symptom,
    priority: kase.priority as string,
    assigneeId: kase.assignee ? String(kase.assignee.id) : '',
  });
  const [form, setForm] = useState(initial);
  const [fields, setFields] = useState<Record<string, string>>({});
  useEffect(() => {
    if (open) setForm(initial());
    // Refilled each time the dialog opens, from the case as it is then.
  }, [open]);
  const set = (k: keyof ReturnType<typeof initial>) => (e: { target: { value: string } }) => setForm((f) => ({ ...f, [k]: e.target.value }));

  function submit(e: FormEvent) {
    e.preventDefault();
    const body = { ...form, assigneeId: form.assigneeId ? Number(form.assigneeId) : null };
    const errs = clientFieldErrors(CasePatchInput, body);
    setFields(errs ?? {});
    if (errs) return;
    update.mutate(body, {
      onSuccess: () => {
        showToast('Case saved', 'ok');
        onClose();
      },
      onError: (err) => setFields(serverFieldErrors(err)),
    });
  }

  return (
    <Dialog open={open} title="Edit the call" onClose={onClose}>
      <form onSubmit={submit} noValidate className="space-y-3">
        {update.isError && !Object.keys(fields).length ? <Notice tone="error" title={errorMessage(update.error)} /> : null}
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Caller's name" value={form.callerName} onChange={set('callerName')} error={fields.callerName} />
          <TextField label="Company" value={form.callerCompany} onChange={set('callerCompany')} error={fields.callerCompany} />
          <TextField label="Phone" type="tel" value={form.callerPhone} onChange={set('callerPhone')} error={fields.callerPhone} />
          <TextField label="E-mail" type="email" value={form.callerEmail} onChange={set('callerEmail')} error={fields.callerEmail} />
          <TextField label="Site" value={form.site} onChange={set('site')} error={fields.site} />
          <TextField label="Line" value={form.line} onChange={set('line')} error={fields.line} />
          <TextField label="Valve" value={form.applicator} onChange={set('applicator')} error={fields.applicator} />
          <SelectField label="Priority" value={form.priority} onChange={set('priority')} error={fields.priority}>
            {CASE_PRIORITIES.map((p) => (
              <option key={p} value={p}>
                {CASE_PRIORITY_LABELS[p]}
              </option>
            ))}
          </SelectField>
        </div>
        <TextField label="What they see" value={form.symptom} onChange={set('symptom')} error={fields.symptom} />
        <SelectField label="Assigned to" value={form.assigneeId} onChange={set('assigneeId')} error={fields.assigneeId}>
          <option value="">Nobody</option>
          {(people.data ?? []).map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectField>
        <div className="flex justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={update.isPending}>
            Save
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
