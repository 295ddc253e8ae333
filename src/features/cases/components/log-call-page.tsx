// Logging a call: who is calling, from where, what they see. A few fields, checked with the same
// schema the server uses, then straight to the case to walk a guide with the caller.
import { useState, type FormEvent } from 'react';
import { Link, useNavigate } from 'react-router';
import { CASE_PRIORITIES, CASE_PRIORITY_LABELS, CaseInput } from '@/shared/schemas/cases';
import { errorMessage } from '@/lib/api-client';
import { clientFieldErrors, serverFieldErrors } from '@/lib/form-errors';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/feedback';
import { TextField, inputClass } from '@/components/ui/field';
import { useCreateCase, usePublishedGuides, useValveSearch, type NewCase, type ValveChoice } from '../api/cases';

const EMPTY: NewCase = { callerName: '', callerCompany: '', callerPhone: '', callerEmail: '', site: '', line: '', applicator: '', applicatorId: null, symptom: '', priority: 'normal' };

function ValvePicker({ picked, onPick }: { picked: ValveChoice | null; onPick: (v: ValveChoice | null) => void }) {
  const [q, setQ] = useState('');
  const found = useValveSearch(q);
  if (picked) {
    return (
      <div className="flex flex-wrap items-center gap-2 rounded-md border border-fixed bg-fixed-wash px-3 py-2">
        <span className="font-semibold text-fixed">
          Registered valve {picked.tag} · {picked.siteName} · {picked.lineName}
        </span>
        <Button variant="quiet" onClick={() => onPick(null)}>
          Remove
        </Button>
      </div>
    );
  }
  return (
    <div>
      <label className="block text-sm font-semibold" htmlFor="valve-search">
        Find a registered valve (optional)
      </label>
      <input id="valve-search" className={`${inputClass} mt-1`} value={q} onChange={(e) => setQ(e.target.value)} placeholder="Tag on the label, e.g. V-31" autoComplete="off" />
      {found.data && found.data.length ? (
        <ul className="mt-1 rounded-md border border-rule bg-paper-raised" aria-label="Registered valves">
          {found.data.map((v) => (
            <li key={v.id}>
              <button type="button" className="block min-h-11 w-full px-3 text-left hover:bg-paper-sunk" onClick={() => onPick(v)}>
                <span className="font-semibold">{v.tag}</span> · {v.siteName} · {v.lineName}
              </button>
            </li>
          ))}
        </ul>
      ) : found.data && q.trim().length >= 2 ? (
        <p className="mt-1 text-sm text-ink-soft">No registered valve matches; type the place below.</p>
      ) : null}
    </div>
  );
}

export function LogCallPage() {
  const navigate = useNavigate();
  const create = useCreateCase();
  const guides = usePublishedGuides();
  const [form, setForm] = useState<NewCase>(EMPTY);
  const [valve, setValve] = useState<ValveChoice | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});
  const set = (k: keyof NewCase) => (e: { target: { value: string } }) => setForm((f) => ({ ...f, [k]: e.target.value }));

  function submit(e: FormEvent) {
    e.preventDefault();
    const body = { ...form, applicatorId: valve?.id ?? null };
    const errs = clientFieldErrors(CaseInput, body);
    setFields(errs ?? {});
    if (errs) return;
    create.mutate(body, {
      onSuccess: (c) => navigate(`/cases/${c.id}`, { replace: true }),
      onError: (err) => setFields(serverFieldErrors(err)),
    });
  }

  const symptoms = [...new Set((guides.data ?? []).map((g) => g.symptom))];

  return (
    <form onSubmit={submit} noValidate className="mx-auto max-w-2xl space-y-6 pb-24 sm:pb-6">
      <div>
        <Link to="/cases" className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
          All cases
        </Link>
        <h1 className="mt-2 text-2xl font-semibold sm:text-3xl">Log a call</h1>
        <p className="mt-1 text-ink-soft">Who is calling, from where, and what they see. You can walk a guide with them on the next page.</p>
      </div>
      {create.isError && !Object.keys(fields).length ? <Notice tone="error" title={errorMessage(create.error)} /> : null}

      <fieldset className="space-y-4 rounded-lg border border-rule bg-paper-raised p-4">
        <legend className="px-1 font-serif text-lg font-semibold">Caller</legend>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Name" value={form.callerName} onChange={set('callerName')} error={fields.callerName} autoComplete="off" />
          <TextField label="Company" value={form.callerCompany} onChange={set('callerCompany')} error={fields.callerCompany} autoComplete="off" />
          <TextField label="Phone" type="tel" inputMode="tel" value={form.callerPhone} onChange={set('callerPhone')} error={fields.callerPhone} autoComplete="off" />
          <TextField
            label="E-mail"
            type="email"
            inputMode="email"
            value={form.callerEmail}
            onChange={set('callerEmail')}
            error={fields.callerEmail}
            hint="For the written summary after the call."
            autoComplete="off"
          />
        </div>
      </fieldset>

      <fieldset className="space-y-4 rounded-lg border border-rule bg-paper-raised p-4">
        <legend className="px-1 font-serif text-lg font-semibold">Where</legend>
        <ValvePicker picked={valve} onPick={setValve} />
        <div className="grid gap-4 sm:grid-cols-3">
          <TextField label="Site" value={form.site} onChange={set('site')} error={fields.site} placeholder={valve?.siteName} autoComplete="off" />
          <TextField label="Line" value={form.line} onChange={set('line')} error={fields.line} placeholder={valve?.lineName} autoComplete="off" />
          <TextField label="Valve" value={form.applicator} onChange={set('applicator')} error={fields.applicator ?? fields.applicatorId} placeholder={valve?.tag} autoComplete="off" />
        </div>
      </fieldset>

      <fieldset className="space-y-4 rounded-lg border border-rule bg-paper-raised p-4">
        <legend className="px-1 font-serif text-lg font-semibold">The fault</legend>
        <div>
          <label htmlFor="symptom" className="mb-1 block text-sm font-semibold">
            What do they see?
          </label>
          <textarea
            id="symptom"
            rows={2}
            className={inputClass}
            value={form.symptom}
            onChange={set('symptom')}
            aria-invalid={fields.symptom ? true : undefined}
            aria-describedby={fields.symptom ? 'symptom-error' : undefined}
            placeholder="In the caller's words, e.g. glue drips after the valve closes"
          />
          {fields.symptom ? (
            <p id="symptom-error" className="mt-1 text-sm font-semibold text-danger">
              {fields.symptom}
            </p>
          ) : null}
          {symptoms.length ? (
            <details className="mt-2">
              <summary className="min-h-11 cursor-pointer content-center text-sm font-semibold text-amber-deep">Or pick one of the symptoms the guides start from</summary>
              <div className="mt-1 flex flex-wrap gap-2" aria-label="Symptoms the guides start from">
                {symptoms.map((s) => (
                  <button
                    key={s}
                    type="button"
                    className="min-h-11 rounded-full border border-amber-line px-3 text-left text-sm font-semibold hover:bg-amber-wash"
                    onClick={() => setForm((f) => ({ ...f, symptom: s }))}
                  >
                    {s}
                  </button>
                ))}
              </div>
            </details>
          ) : null}
        </div>
        <fieldset>
          <legend className="mb-1 text-sm font-semibold">Priority</legend>
          <div className="flex flex-wrap gap-2">
            {CASE_PRIORITIES.map((p) => (
              <label
                key={p}
                className={`flex min-h-11 cursor-pointer items-center gap-2 rounded-md border px-3 ${form.priority === p ? 'border-amber bg-amber-wash' : 'border-rule-strong bg-paper-raised'}`}
              >
                <input type="radio" name="priority" className="size-5 accent-[#9C5700]" checked={form.priority === p} onChange={() => setForm((f) => ({ ...f, priority: p }))} />
                {CASE_PRIORITY_LABELS[p]}
              </label>
            ))}
          </div>
        </fieldset>
      </fieldset>

      <div className="fixed inset-x-0 bottom-0 z-20 border-t border-rule bg-paper/95 px-4 py-2 backdrop-blur sm:static sm:border-0 sm:bg-transparent sm:p-0">
        <Button type="submit" className="w-full !min-h-14 text-lg sm:w-auto" busy={create.isPending}>
          Log the call
        </Button>
      </div>
    </form>
  );
}
