// Admin settings: the organisation's name, whether authors may publish their own work, tag lists.
import { useEffect, useState } from 'react';
import { TAG_GROUPS, TAG_GROUP_LABELS, type TagGroup } from '@/shared/tags';
import { slugify } from '@/shared/schemas/articles';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { Card, PageHeader } from '@/components/ui/page';
import { COMMON_PRACTICE_INTERVALS, type OrgSettings, type ServiceIntervals } from '@/shared/schemas/settings';
import { ApiError } from '@/lib/api-client';
import { useAdminCauses, useAdminTags, useSaveCauses, useSaveSettings, useSaveTags, useSettings, type AdminCause, type AdminTag } from '../api/settings';

function CauseEditor() {
  const causes = useAdminCauses();
  const save = useSaveCauses();
  const [list, setList] = useState<AdminCause[] | null>(null);
  const [label, setLabel] = useState('');
  useEffect(() => {
    if (causes.data && !list) setList(causes.data);
  }, [causes.data, list]);
  if (causes.isPending || !list) return <LoadingBlock label="Loading causes" />;
  if (causes.isError) return <Notice tone="error" title="Causes could not be loaded" />;
  return (
    <Card>
      <h2 className="text-lg font-semibold">Causes</h2>
      <p className="mt-1 text-ink-soft">Every Finding in every guide names one of these, so recurring causes can be counted across guides. A cause turned off stays on old findings and walks.</p>
      <ul className="mt-3 space-y-1">
        {list.map((c, i) => (
          <li key={c.code} className="flex flex-wrap items-center gap-2">
            <label className="flex min-h-11 flex-1 items-center gap-2">
              <input type="checkbox" className="size-4" checked={c.active} onChange={() => setList(list.map((x, k) => (k === i ? { ...x, active: !x.active } : x)))} />
              <input
                aria-label={`Cause ${c.code}`}
                className="min-h-11 flex-1 rounded-md border border-rule-strong bg-paper-raised px-2"
                value={c.label}
                onChange={(e) => setList(list.map((x, k) => (k === i ? { ...x, label: e.target.value } : x)))}
              />
            </label>
            <code className="text-xs text-ink-soft">{c.code}</code>
          </li>
        ))}
      </ul>
      <form
        className="mt-3 flex gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          const code = slugify(label);
          if (!code) return;
          if (list.some((c) => c.code === code)) return showToast(`“${label}” is already a cause`, 'error');
          setList([...list, { code, label: label.trim(), component: null, active: true }]);
          setLabel('');
        }}
      >
        <TextField label="New cause" className="flex-1" value={label} onChange={(e) => setLabel(e.target.value)} />
        <Button type="submit" variant="secondary" className="self-end">
          Add
        </Button>
      </form>
      <Button
        className="mt-4"
        busy={save.isPending}
        onClick={() =>
          save.mutate(list, {
            onSuccess: (c) => {
              setList(c);
              showToast('Causes saved', 'ok');
            },
          })
        }
      >
        Save causes
      </Button>
    </Card>
  );
}

function TagEditor() {
  const tags = useAdminTags();
  const save = useSaveTags();
  const [list, setList] = useState<AdminTag[] | null>(null);
  const [adding, setAdding] = useState<Record<TagGroup, string>>({ actuation: '', component: '', fluid: '' });
  useEffect(() => {
    if (tags.data && !list) setList(tags.data);
  }, [tags.data, list]);
  if (tags.isPending || !list) return <LoadingBlock label="Loading tags" />;
  if (tags.isError) return <Notice tone="error" title="Tags could not be loaded" />;
  return (
    <Card>
      <h2 className="text-lg font-semibold">Tags</h2>
      <p className="mt-1 text-ink-soft">Authors tag articles and guides with these; readers filter by them. A tag turned off stays on old content but cannot be chosen again.</p>
      <div className="mt-4 space-y-5">
        {TAG_GROUPS.map((g) => (
          <fieldset key={g}>
            <legend className="mb-2 font-semibold">{TAG_GROUP_LABELS[g]}</legend>
            <ul className="flex flex-wrap gap-2">
              {list
                .filter((t) => t.group === g)
                .map((t) => (
                  <li key={t.slug}>
                    <label
                      className={`flex min-h-11 items-center gap-2 rounded-full border px-3 ${t.active ? 'border-rule-strong bg-paper-raised' : 'border-dashed border-rule text-ink-faint line-through'}`}
                    >
                      <input type="checkbox" className="size-4" checked={t.active} onChange={() => setList(list.map((x) => (x.slug === t.slug ? { ...x, active: !x.active } : x)))} />
                      {t.label}
                    </label>
                  </li>
                ))}
            </ul>
            <form
              className="mt-2 flex gap-2"
              onSubmit={(e) => {
                e.preventDefault();
                const label = adding[g].trim();
                const slug = slugify(label);
                if (!label || !slug) return;
                if (list.some((t) => t.slug === slug)) return showToast(`“${label}” is already a tag`, 'error');
                setList([...list, { group: g, slug, label, active: true }]);
                setAdding({ ...adding, [g]: '' });
              }}
            >
              <TextField label={`New ${TAG_GROUP_LABELS[g].toLowerCase()} tag`} className="flex-1" value={adding[g]} onChange={(e) => setAdding({ ...adding, [g]: e.target.value })} />
              <Button type="submit" variant="secondary" className="self-end">
                Add
              </Button>
            </form>
          </fieldset>
        ))}
      </div>
      <Button
        className="mt-4"
        busy={save.isPending}
        onClick={() =>
          save.mutate(list, {
            onSuccess: (t) => {
              setList(t);
              showToast('Tags saved', 'ok');
            },
          })
        }
      >
        Save tags
      </Button>
    </Card>
  );
}

const INTERVAL_FIELDS: { key: keyof ServiceIntervals; label: string; hint: string }[] = [
  { key: 'seatCycles', label: 'Seat', hint: 'common practice about 100 million cycles' },
  { key: 'needleCycles', label: 'Needle', hint: 'common practice about 500 million cycles' },
  { key: 'sealsCycles', label: 'Seals (air-operated valves)', hint: 'common practice about half the seat interval' },
];

function UnitsCard({ settings }: { settings: OrgSettings }) {
  const save = useSaveSettings();
  return (
    <Card>
      <h2 className="text-lg font-semibold">Units</h2>
      <p className="mt-1 text-ink-soft">The unit system for people who have not chosen their own on their account page. Everyone can still enter a value in either system.</p>
      <fieldset className="mt-3">
        <legend className="sr-only">Default unit system</legend>
        <div className="flex flex-wrap gap-4">
          {(['metric', 'imperial'] as const).map((u) => (
            <label key={u} className="flex min-h-11 items-center gap-2">
              <input
                type="radio"
                name="default-unit-system"
                className="size-5"
                checked={settings.defaultUnitSystem === u}
                onChange={() => save.mutate({ defaultUnitSystem: u }, { onSuccess: () => showToast('Default unit system saved', 'ok') })}
              />
              {u === 'metric' ? 'Metric (bar, mm, °C)' : 'US customary (psi, in, °F)'}
            </label>
          ))}
        </div>
      </fieldset>
    </Card>
  );
}

function IntervalsCard({ settings }: { settings: OrgSettings }) {
  const save = useSaveSettings();
  const [draft, setDraft] = useState<Record<keyof ServiceIntervals, string>>(() => ({
    seatCycles: String(settings.serviceIntervals.seatCycles),
    needleCycles: String(settings.serviceIntervals.needleCycles),
    sealsCycles: String(settings.serviceIntervals.sealsCycles),
  }));
  const [errors, setErrors] = useState<Partial<Record<string, string>>>({});
  const reset = (s: ServiceIntervals) => setDraft({ seatCycles: String(s.seatCycles), needleCycles: String(s.needleCycles), sealsCycles: String(s.sealsCycles) });
  const onError = (err: unknown) => {
    if (err instanceof ApiError && Object.keys(err.fields).length > 0) {
      setErrors(Object.fromEntries(Object.entries(err.fields).map(([k, v]) => [k.replace(/^serviceIntervals\./, ''), v])));
    } else showToast('Intervals could not be saved', 'error');
  };
  return (
    <Card>
      <h2 className="text-lg font-semibold">Default service intervals</h2>
      <p className="mt-1 text-ink-soft">
        Used for forecasts and for the reliability comparison where an applicator has no interval of its own.{' '}
        {settings.serviceIntervalsAreDefault
          ? 'These are the common-practice values; check them against the valve maker’s manual for your valves and fluids.'
          : 'Your organisation has set its own values.'}
      </p>
      <form
        className="mt-3 grid gap-3 sm:grid-cols-3"
        onSubmit={(e) => {
          e.preventDefault();
          setErrors({});
          const parsed = Object.fromEntries(Object.entries(draft).map(([k, v]) => [k, Number(v.replace(/[\s,_]/g, ''))])) as unknown as ServiceIntervals;
          save.mutate(
            { serviceIntervals: parsed },
            {
              onSuccess: (s) => {
                reset(s.serviceIntervals);
                showToast('Intervals saved', 'ok');
              },
              onError,
            },
          );
        }}
      >
        {INTERVAL_FIELDS.map((f) => (
          <TextField
            key={f.key}
            label={`${f.label} (cycles)`}
            hint={f.hint}
            inputMode="numeric"
            value={draft[f.key]}
            error={errors[f.key]}
            onChange={(e) => setDraft({ ...draft, [f.key]: e.target.value })}
          />
        ))}
        <div className="flex flex-wrap gap-2 sm:col-span-3">
          <Button type="submit" busy={save.isPending}>
            Save intervals
          </Button>
          {!settings.serviceIntervalsAreDefault && (
            <Button
              type="button"
              variant="secondary"
              onClick={() =>
                save.mutate(
                  { serviceIntervals: null },
                  {
                    onSuccess: (s) => {
                      reset(s.serviceIntervals);
                      showToast('Common-practice intervals restored', 'ok');
                    },
                  },
                )
              }
            >
              Use common practice ({COMMON_PRACTICE_INTERVALS.seatCycles / 1e6} M / {COMMON_PRACTICE_INTERVALS.needleCycles / 1e6} M / {COMMON_PRACTICE_INTERVALS.sealsCycles / 1e6} M)
            </Button>
          )}
        </div>
      </form>
    </Card>
  );
}

export function SettingsPage() {
  const settings = useSettings();
  const save = useSaveSettings();
  return (
    <div className="max-w-3xl">
      <PageHeader title="Settings" lead="How your organisation works in Beadpath." />
      <div className="space-y-6">
        {settings.isPending ? (
          <LoadingBlock />
        ) : settings.isError ? (
          <Notice tone="error" title="Settings could not be loaded" />
        ) : (
          <Card>
            <h2 className="text-lg font-semibold">Review</h2>
            <label className="mt-3 flex min-h-11 cursor-pointer items-start gap-3">
              <input
                type="checkbox"
                className="mt-1 size-5"
                checked={settings.data.allowSelfPublish}
                onChange={(e) => save.mutate({ allowSelfPublish: e.target.checked }, { onSuccess: () => showToast('Saved', 'ok') })}
              />
              <span>
                <span className="font-semibold">Authors may approve their own articles and guides</span>
                <span className="block text-sm text-ink-soft">Off by default: a second author checks every change before technicians see it. Turn on only where there is a single author.</span>
              </span>
            </label>
          </Card>
        )}
        {settings.data && <UnitsCard settings={settings.data} />}
        {settings.data && <IntervalsCard key={JSON.stringify(settings.data.serviceIntervals)} settings={settings.data} />}
        <TagEditor />
        <CauseEditor />
      </div>
    </div>
  );
}
