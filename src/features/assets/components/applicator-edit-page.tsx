// Adding or editing an applicator: where it is, the valve, needle and seat, the fluid, the
// expected rate and intervals, and the organisation's own fields. The server's field messages
// land under the field they name.
import { useEffect, useState, type FormEvent, type ReactNode } from 'react';
import { Link, useNavigate, useParams } from 'react-router';
import {
  ACTUATION_LABELS,
  ACTUATIONS,
  APPLICATOR_STATUS_LABELS,
  APPLICATOR_STATUSES,
  COIL_DRIVE_LABELS,
  COIL_DRIVES,
  NEEDLE_TIP_LABELS,
  NEEDLE_TIPS,
  localToday,
  type ApplicatorDetail,
  type CustomValue,
  type FieldView,
} from '@/shared/schemas/assets';
import { DEFAULT_THRESHOLDS } from '@/shared/calculators/service-forecast';
import { ApiError, errorMessage } from '@/lib/api-client';
import { useTags } from '@/lib/tags';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { EmptyState, LoadingBlock, Notice } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { PageHeader } from '@/components/ui/page';
import { useApplicator, useFields, useLines, useSaveApplicator } from '../api/assets';
import { formatInteger } from '@/lib/format';

type Form = Record<string, string>;

const NUMBER_KEYS = [
  'airPressureBar',
  'orificeDiameterMm',
  'viscosityMPas',
  'viscosityTemperatureC',
  'densityGPerCm3',
  'setTemperatureC',
  'cyclesPerMinute',
  'hoursPerDay',
  'daysPerWeek',
  'seatIntervalCycles',
  'needleIntervalCycles',
  'sealsIntervalCycles',
] as const;
const TEXT_KEYS = ['tag', 'needleMaterial', 'seatMaterial', 'nozzle', 'fluidFamily', 'fluidName', 'installedOn', 'coilDrive', 'needleTip'] as const;

function toForm(a?: ApplicatorDetail): Form {
  const f: Form = { lineId: a ? String(a.lineId) : '', actuation: a?.actuation ?? 'electric', status: a?.status ?? 'running', heated: a?.heated ? 'yes' : 'no' };
  for (const k of [...NUMBER_KEYS, ...TEXT_KEYS]) {
    const v = a?.[k];
    f[k] = v === null || v === undefined ? '' : String(v);
  }
  for (const [id, v] of Object.entries(a?.custom ?? {})) f[`custom.${id}`] = v === null ? '' : typeof v === 'boolean' ? (v ? 'yes' : 'no') : String(v);
  return f;
}

/** Numbers typed with a decimal comma or spaces are read as the person meant them. */
function readNumber(text: string): number | null | string {
  const t = text
    .trim()
    .replace(/[\s_]/g, '')
    .replace(/^(-?\d*),(\d+)$/, '$1.$2');
  if (!t) return null;
  const n = Number(t);
  return Number.isFinite(n) ? n : text;
}

function toBody(f: Form, fields: FieldView[]): { body: Record<string, unknown>; errors: Record<string, string> } {
  const errors: Record<string, string> = {};
  const body: Record<string, unknown> = { lineId: Number(f.lineId) || 0, actuation: f.actuation, status: f.status, heated: f.heated === 'yes' };
  for (const k of TEXT_KEYS) body[k] = f[k]?.trim() ? f[k].trim() : null;
  for (const k of NUMBER_KEYS) {
    const v = readNumber(f[k] ?? '');
    if (typeof v === 'string') errors[k] = `'${v}' is not a number`;
    body[k] = typeof v === 'number' ? v : null;
  }
  if (f.actuation === 'air-operated') body.coilDrive = null;
  else body.airPressureBar = null;
  if (f.heated !== 'yes') body.setTemperatureC = null;
  const custom: Record<string, CustomValue> = {};
  for (const field of fields) {
    const raw = (f[`custom.${field.id}`] ?? '').trim();
    if (!raw) continue;
    if (field.type === 'number') {
      const v = readNumber(raw);
      if (typeof v === 'string') errors[`custom.${field.id}`] = `'${v}' is not a number`;
      else custom[field.id] = v;
    } else if (field.type === 'yes-no') custom[field.id] = raw === 'yes';
    else custom[field.id] = raw;
  }
  body.custom = custom;
  return { body, errors };
}

function Section({ title, children, lead }: { title: string; lead?: ReactNode; children: ReactNode }) {
  return (
    <fieldset className="rounded-lg border border-rule bg-paper-raised p-4">
      <legend className="px-1 font-serif text-lg font-semibold">{title}</legend>
      {lead ? <p className="mb-3 text-sm text-ink-soft">{lead}</p> : null}
      <div className="grid gap-4 sm:grid-cols-2">{children}</div>
    </fieldset>
  );
}

export function ApplicatorEditPage() {
  const id = Number(useParams().id ?? 0);
  const existing = useApplicator(id);
  if (id && existing.isPending) return <LoadingBlock label="Opening the applicator" />;
  if (id && existing.isError)
    return (
      <Notice tone="error" title="This applicator could not be opened">
        {errorMessage(existing.error)}
      </Notice>
    );
  return <EditForm key={existing.data?.id ?? 'new'} current={existing.data} />;
}

function EditForm({ current }: { current?: ApplicatorDetail }) {
  const navigate = useNavigate();
  const lines = useLines();
  const fields = useFields();
  const tags = useTags();
  const save = useSaveApplicator(current?.id);
  const [f, setF] = useState<Form>(() => toForm(current));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const set = (k: string) => (e: { target: { value: string } }) => setF((x) => ({ ...x, [k]: e.target.value }));
  const err = (k: string) => errors[k];
  useEffect(() => {
    if (!f.lineId && lines.data?.length === 1) setF((x) => ({ ...x, lineId: String(lines.data![0].id) }));
  }, [lines.data, f.lineId]);

  if (lines.isPending || fields.isPending) return <LoadingBlock />;
  if (lines.data && lines.data.length === 0) {
    return (
      <EmptyState title="Add a site and a line first">
        <p>
          An applicator sits on a line at a site.{' '}
          <Link className="font-semibold text-amber-deep underline" to="/applicators/sites">
            Add them here
          </Link>
          .
        </p>
      </EmptyState>
    );
  }
  const ownFields = fields.data ?? [];

  function submit(e: FormEvent) {
    e.preventDefault();
    const { body, errors: local } = toBody(f, ownFields);
    if (Object.keys(local).length) {
      setErrors(local);
      return;
    }
    save.mutate(body, {
      onSuccess: (a) => {
        showToast(current ? 'Applicator saved' : `Applicator ${a.tag} added`, 'ok');
        navigate(`/applicators/${a.id}`);
      },
      onError: (err) => setErrors(err instanceof ApiError ? err.fields : {}),
    });
  }

  const fluids = (tags.data ?? []).filter((t) => t.group === 'fluid' && (t.active || t.slug === f.fluidFamily));
  const summary = save.isError && !Object.keys(errors).length ? errorMessage(save.error) : Object.keys(errors).length ? 'Some fields need attention; see the messages under them.' : null;

  return (
    <form onSubmit={submit} className="mx-auto max-w-3xl space-y-5 pb-24" noValidate>
      <Link to={current ? `/applicators/${current.id}` : '/applicators'} className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
        ← {current ? current.tag : 'Applicators'}
      </Link>
      <PageHeader title={current ? `Edit ${current.tag}` : 'Add an applicator'} lead="Only the line, the tag and the actuation are required; fill in what you know now and the rest later." />
      <Section title="Where it is">
        <SelectField label="Line (site · line)" value={f.lineId} onChange={set('lineId')} error={err('lineId')}>
          <option value="">Choose the line</option>
          {(lines.data ?? []).map((l) => (
            <option key={l.id} value={l.id}>
              {l.siteName} · {l.name}
            </option>
          ))}
        </SelectField>
        <TextField label="Tag (the plant’s asset number)" value={f.tag} onChange={set('tag')} error={err('tag')} autoComplete="off" />
        <SelectField label="Status" value={f.status} onChange={set('status')} error={err('status')}>
          {APPLICATOR_STATUSES.map((s) => (
            <option key={s} value={s}>
              {APPLICATOR_STATUS_LABELS[s]}
            </option>
          ))}
        </SelectField>
        <TextField label="Installed on" type="date" max={localToday()} value={f.installedOn} onChange={set('installedOn')} error={err('installedOn')} />
      </Section>

      <Section title="Valve">
        <SelectField label="Actuation" value={f.actuation} onChange={set('actuation')} error={err('actuation')}>
          {ACTUATIONS.map((x) => (
            <option key={x} value={x}>
              {ACTUATION_LABELS[x]}
            </option>
          ))}
        </SelectField>
        {f.actuation === 'electric' ? (
          <SelectField label="Coil drive" value={f.coilDrive} onChange={set('coilDrive')} error={err('coilDrive')}>
            <option value="">Not known</option>
            {COIL_DRIVES.map((x) => (
              <option key={x} value={x}>
                {COIL_DRIVE_LABELS[x]}
              </option>
            ))}
          </SelectField>
        ) : (
          <TextField label="Air pressure (bar)" inputMode="decimal" value={f.airPressureBar} onChange={set('airPressureBar')} error={err('airPressureBar')} />
        )}
        <TextField label="Nozzle" value={f.nozzle} onChange={set('nozzle')} error={err('nozzle')} placeholder="e.g. single orifice 0.5 mm" />
      </Section>

      <Section title="Needle and seat">
        <SelectField label="Needle tip" value={f.needleTip} onChange={set('needleTip')} error={err('needleTip')}>
          <option value="">Not known</option>
          {NEEDLE_TIPS.map((x) => (
            <option key={x} value={x}>
              {NEEDLE_TIP_LABELS[x]}
            </option>
          ))}
        </SelectField>
        <TextField label="Needle material" value={f.needleMaterial} onChange={set('needleMaterial')} error={err('needleMaterial')} placeholder="e.g. tungsten carbide" />
        <TextField label="Seat material" value={f.seatMaterial} onChange={set('seatMaterial')} error={err('seatMaterial')} placeholder="e.g. stainless steel" />
        <TextField label="Orifice diameter (mm)" inputMode="decimal" value={f.orificeDiameterMm} onChange={set('orificeDiameterMm')} error={err('orificeDiameterMm')} />
      </Section>

      <Section title="Fluid">
        <SelectField label="Fluid family" value={f.fluidFamily} onChange={set('fluidFamily')} error={err('fluidFamily')}>
          <option value="">Not known</option>
          {fluids.map((t) => (
            <option key={t.slug} value={t.slug}>
              {t.label}
            </option>
          ))}
        </SelectField>
        <TextField label="Fluid name" value={f.fluidName} onChange={set('fluidName')} error={err('fluidName')} />
        <TextField label="Viscosity (mPa·s)" inputMode="decimal" value={f.viscosityMPas} onChange={set('viscosityMPas')} error={err('viscosityMPas')} />
        <TextField label="…measured at (°C)" inputMode="decimal" value={f.viscosityTemperatureC} onChange={set('viscosityTemperatureC')} error={err('viscosityTemperatureC')} />
        <TextField label="Density (g/cm³)" inputMode="decimal" value={f.densityGPerCm3} onChange={set('densityGPerCm3')} error={err('densityGPerCm3')} />
        <SelectField label="Heated" value={f.heated} onChange={set('heated')} error={err('heated')}>
          <option value="no">No</option>
          <option value="yes">Yes</option>
        </SelectField>
        {f.heated === 'yes' ? <TextField label="Set temperature (°C)" inputMode="decimal" value={f.setTemperatureC} onChange={set('setTemperatureC')} error={err('setTemperatureC')} /> : null}
      </Section>

      <Section
        title="Expected rate and service intervals"
        lead="The expected rate carries the counter forward when no recent reading exists. Leave an interval empty to use the common-practice figure shown; the valve maker’s figure is better when you have it."
      >
        <TextField label="Cycles per minute" inputMode="decimal" value={f.cyclesPerMinute} onChange={set('cyclesPerMinute')} error={err('cyclesPerMinute')} />
        <TextField label="Running hours per day" inputMode="decimal" value={f.hoursPerDay} onChange={set('hoursPerDay')} error={err('hoursPerDay')} />
        <TextField label="Running days per week" inputMode="decimal" value={f.daysPerWeek} onChange={set('daysPerWeek')} error={err('daysPerWeek')} />
        <TextField
          label="Seat interval (cycles)"
          inputMode="numeric"
          value={f.seatIntervalCycles}
          onChange={set('seatIntervalCycles')}
          error={err('seatIntervalCycles')}
          placeholder={`${formatInteger(DEFAULT_THRESHOLDS.seat)} (common practice)`}
        />
        <TextField
          label="Needle interval (cycles)"
          inputMode="numeric"
          value={f.needleIntervalCycles}
          onChange={set('needleIntervalCycles')}
          error={err('needleIntervalCycles')}
          placeholder={`${formatInteger(DEFAULT_THRESHOLDS.needle)} (common practice)`}
        />
        {f.actuation === 'air-operated' ? (
          <TextField
            label="Seals interval (cycles)"
            inputMode="numeric"
            value={f.sealsIntervalCycles}
            onChange={set('sealsIntervalCycles')}
            error={err('sealsIntervalCycles')}
            placeholder={`${formatInteger(DEFAULT_THRESHOLDS.seals)} (common practice)`}
          />
        ) : null}
      </Section>

      {ownFields.length ? (
        <Section
          title="Your organisation’s fields"
          lead={
            <>
              Defined on{' '}
              <Link className="font-semibold text-amber-deep underline" to="/applicators/sites">
                Sites and lines
              </Link>
              .
            </>
          }
        >
          {ownFields.map((field) => {
            const k = `custom.${field.id}`;
            const label = field.unit ? `${field.name} (${field.unit})` : field.name;
            if (field.type === 'yes-no') {
              return (
                <SelectField key={field.id} label={label} value={f[k] ?? ''} onChange={set(k)} error={err(k)}>
                  <option value="">Not known</option>
                  <option value="yes">Yes</option>
                  <option value="no">No</option>
                </SelectField>
              );
            }
            return (
              <TextField
                key={field.id}
                label={label}
                type={field.type === 'date' ? 'date' : 'text'}
                inputMode={field.type === 'number' ? 'decimal' : undefined}
                value={f[k] ?? ''}
                onChange={set(k)}
                error={err(k)}
              />
            );
          })}
        </Section>
      ) : null}

      {summary ? <Notice tone="error" title={summary} /> : null}
      <div className="fixed inset-x-0 bottom-0 z-20 border-t border-rule bg-paper/95 px-4 py-2 backdrop-blur">
        <div className="mx-auto flex max-w-3xl justify-end gap-2">
          <Button variant="secondary" onClick={() => navigate(current ? `/applicators/${current.id}` : '/applicators')}>
            Cancel
          </Button>
          <Button type="submit" busy={save.isPending}>
            {current ? 'Save changes' : 'Add applicator'}
          </Button>
        </div>
      </div>
    </form>
  );
}
