// Recording a service on a phone: what was done (ticked, not typed), the cause when it was a
// failure, parts, the counter, photos. A walk that ended "fixed" arrives here with its walk and
// cause already filled in.
import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useParams, useSearchParams } from 'react-router';
import { SERVICE_ACTION_LABELS, SERVICE_ACTIONS, localToday, type ApplicatorDetail, type ServiceAction } from '@/shared/schemas/assets';
import { ApiError, errorMessage } from '@/lib/api-client';
import { useMe } from '@/lib/auth';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { inputClass, SelectField, TextField } from '@/components/ui/field';
import { NotFoundPage } from '@/components/errors/route-error';
import { PhotoCaptureButton } from '@/components/ui/photo-capture';
import { useAddServiceEvent, useApplicator, useCauses } from '../api/assets';
import { ACTIONS_FOR_CAUSE, exactCycles, longDate } from '../utils/format';
import { ServiceCaution } from './applicator-page';

export function ServiceEventPage() {
  const id = Number(useParams().id);
  const q = useApplicator(Number.isInteger(id) ? id : 0);
  if (q.isPending) return <LoadingBlock label="Opening the applicator" />;
  if (q.isError)
    return q.error instanceof ApiError && q.error.status === 404 ? (
      <NotFoundPage />
    ) : (
      <Notice tone="error" title="This applicator could not be opened">
        {errorMessage(q.error)}
      </Notice>
    );
  return <ServiceForm a={q.data} />;
}

interface PartRow {
  name: string;
  partNumber: string;
  quantity: string;
}

function ServiceForm({ a }: { a: ApplicatorDetail }) {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const { data: me } = useMe();
  const causes = useCauses();
  const add = useAddServiceEvent(a.id);
  const walkId = Number(params.get('walkId')) || null;
  const prefillCause = params.get('cause') ?? '';
  const [performedOn, setPerformedOn] = useState(localToday());
  const [actions, setActions] = useState<ServiceAction[]>(ACTIONS_FOR_CAUSE[prefillCause] ?? []);
  const [otherAction, setOtherAction] = useState('');
  const [failure, setFailure] = useState(Boolean(prefillCause));
  const [causeCode, setCauseCode] = useState(prefillCause);
  const [parts, setParts] = useState<PartRow[]>([]);
  const [cycleCount, setCycleCount] = useState('');
  const [counterReset, setCounterReset] = useState(false);
  const [performedBy, setPerformedBy] = useState(me?.user.name ?? '');
  const [notes, setNotes] = useState('');
  const [photos, setPhotos] = useState<{ id: string; url: string }[]>([]);
  const [fields, setFields] = useState<Record<string, string>>({});

  const toggle = (x: ServiceAction) => setActions((list) => (list.includes(x) ? list.filter((y) => y !== x) : [...list, x]));

  function submit(e: FormEvent) {
    e.preventDefault();
    const local: Record<string, string> = {};
    const count = cycleCount.trim() ? Number(cycleCount.replace(/[\s,_]/g, '')) : null;
    if (count !== null && !Number.isFinite(count)) local.cycleCount = 'Type the number shown on the counter';
    if (!actions.length) local.actions = 'Tick what was done';
    if (failure && !causeCode) local.causeCode = 'Choose the cause, or untick “It was a failure”';
    parts.forEach((p, i) => {
      if (!p.name.trim()) local[`parts.${i}.name`] = 'Name the part, or remove the row';
    });
    if (Object.keys(local).length) {
      setFields(local);
      return;
    }
    add.mutate(
      {
        body: {
          performedOn,
          actions,
          otherAction: actions.includes('other') ? otherAction : null,
          causeCode: failure ? causeCode : null,
          parts: parts.map((p) => ({ name: p.name, partNumber: p.partNumber || null, quantity: Number(p.quantity) || 0 })),
          cycleCount: count,
          counterReset: count !== null && counterReset,
          performedBy: performedBy || null,
          notes: notes || null,
          fileIds: photos.map((p) => p.id),
          walkId,
        },
      },
      {
        onSuccess: () => {
          showToast(`Service on ${a.tag} recorded`, 'ok');
          navigate(`/applicators/${a.id}`, { replace: true });
        },
        onError: (err) => setFields(err instanceof ApiError ? err.fields : {}),
      },
    );
  }

  const activeCauses = (causes.data ?? []).filter((c) => c.active || c.code === causeCode);
  const problem = add.isError && !Object.keys(fields).length ? errorMessage(add.error) : Object.keys(fields).length ? 'Some entries need attention; see the messages under them.' : null;

  return (
    <form onSubmit={submit} className="mx-auto max-w-xl space-y-5 pb-28" noValidate>
      <div>
        <Link to={`/applicators/${a.id}`} className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
          ← {a.tag}
        </Link>
        <h1 className="text-2xl font-semibold">Record service on {a.tag}</h1>
        <p className="text-ink-soft">
          {a.siteName} · {a.lineName}
        </p>
      </div>
      {walkId ? (
        <Notice tone="ok" title="Linked to the walk that found the cause">
          <Link className="font-semibold underline" to={`/walks/${walkId}/summary`}>
            See the walk’s record
          </Link>
          . Check the entries below and change what differs.
        </Notice>
      ) : null}
      <ServiceCaution a={a} />

      <fieldset>
        <legend className="mb-2 font-semibold">What was done</legend>
        <div className="grid grid-cols-2 gap-2">
          {SERVICE_ACTIONS.map((x) => (
            <label
              key={x}
              className={`flex min-h-12 cursor-pointer items-center gap-3 rounded-md border px-3 ${actions.includes(x) ? 'border-amber bg-amber-wash font-semibold' : 'border-rule-strong bg-paper-raised'}`}
            >
              <input type="checkbox" className="size-5 accent-[#9C5700]" checked={actions.includes(x)} onChange={() => toggle(x)} />
              {SERVICE_ACTION_LABELS[x]}
            </label>
          ))}
        </div>
        {fields.actions ? <p className="mt-1 text-sm font-semibold text-danger">{fields.actions}</p> : null}
        {actions.includes('other') ? <TextField className="mt-3" label="What else was done" value={otherAction} onChange={(e) => setOtherAction(e.target.value)} error={fields.otherAction} /> : null}
      </fieldset>

      <div className="space-y-3">
        <label className="flex min-h-11 items-center gap-3 font-semibold">
          <input type="checkbox" className="size-6" checked={failure} onChange={(e) => setFailure(e.target.checked)} />
          It was a failure (not planned)
        </label>
        {failure ? (
          <SelectField label="Cause" value={causeCode} onChange={(e) => setCauseCode(e.target.value)} error={fields.causeCode}>
            <option value="">Choose the cause</option>
            {activeCauses.map((c) => (
              <option key={c.code} value={c.code}>
                {c.label}
              </option>
            ))}
          </SelectField>
        ) : null}
      </div>

      <TextField label="Date of the service" type="date" max={localToday()} value={performedOn} onChange={(e) => setPerformedOn(e.target.value)} error={fields.performedOn} />

      <fieldset className="space-y-2">
        <legend className="mb-1 font-semibold">Parts used</legend>
        {parts.map((p, i) => (
          <div key={i} className="grid grid-cols-[1fr_5rem] gap-2 rounded-md border border-rule p-2 sm:grid-cols-[1fr_9rem_5rem_auto]">
            <TextField label="Part" value={p.name} onChange={(e) => setParts((ps) => ps.map((x, j) => (j === i ? { ...x, name: e.target.value } : x)))} error={fields[`parts.${i}.name`]} />
            <TextField
              label="Qty"
              inputMode="numeric"
              value={p.quantity}
              onChange={(e) => setParts((ps) => ps.map((x, j) => (j === i ? { ...x, quantity: e.target.value } : x)))}
              error={fields[`parts.${i}.quantity`]}
              className="sm:order-3"
            />
            <TextField
              label="Part number"
              value={p.partNumber}
              onChange={(e) => setParts((ps) => ps.map((x, j) => (j === i ? { ...x, partNumber: e.target.value } : x)))}
              error={fields[`parts.${i}.partNumber`]}
              className="sm:order-2"
            />
            <Button variant="quiet" className="self-end sm:order-4" onClick={() => setParts((ps) => ps.filter((_, j) => j !== i))}>
              Remove
            </Button>
          </div>
        ))}
        <Button variant="secondary" onClick={() => setParts((ps) => [...ps, { name: '', partNumber: '', quantity: '1' }])}>
          Add a part
        </Button>
      </fieldset>

      <div className="space-y-2">
        <TextField
          label="Counter at the service (cycles, optional)"
          inputMode="numeric"
          value={cycleCount}
          onChange={(e) => setCycleCount(e.target.value)}
          error={fields.cycleCount}
          hint={a.counter.lastCount !== null ? `Last reading: ${exactCycles(a.counter.lastCount)} on ${longDate(a.counter.lastReadingOn)}` : 'Read it on the valve’s controller'}
        />
        {cycleCount.trim() ? (
          <label className="flex min-h-11 items-start gap-3">
            <input type="checkbox" className="mt-1 size-6" checked={counterReset} onChange={(e) => setCounterReset(e.target.checked)} />
            <span>
              <span className="font-semibold">Counter reset</span>
              <span className="block text-sm text-ink-soft">The valve or its controller was replaced, so the counter started again.</span>
            </span>
          </label>
        ) : null}
      </div>

      <TextField label="Done by" value={performedBy} onChange={(e) => setPerformedBy(e.target.value)} error={fields.performedBy} />
      <label className="block">
        <span className="mb-1 block text-sm font-semibold">Notes (optional)</span>
        <textarea className={inputClass} rows={3} value={notes} onChange={(e) => setNotes(e.target.value)} placeholder="What you saw, what you set" />
        {fields.notes ? <span className="mt-1 block text-sm font-semibold text-danger">{fields.notes}</span> : null}
      </label>

      <div>
        <PhotoCaptureButton onAdded={(photo) => setPhotos((x) => [...x, photo])} />
        {fields.fileIds ? <p className="mt-1 text-sm font-semibold text-danger">{fields.fileIds}</p> : null}
        <div className="mt-2 flex flex-wrap gap-2">
          {photos.map((p) => (
            <img key={p.id} src={p.url} alt="Photo added to the service record" className="size-20 rounded object-cover" />
          ))}
        </div>
      </div>

      {problem ? <Notice tone="error" title={problem} /> : null}
      <div className="fixed inset-x-0 bottom-0 z-20 border-t border-rule bg-paper/95 px-4 py-2 backdrop-blur">
        <div className="mx-auto max-w-xl">
          <Button type="submit" className="w-full !min-h-14 text-lg" busy={add.isPending}>
            Record service
          </Button>
        </div>
      </div>
    </form>
  );
}
