// Admin settings: the organisation's name, whether authors may publish their own work, tag lists.
import { useEffect, useState } from 'react';
import { TAG_GROUPS, TAG_GROUP_LABELS, type TagGroup } from '@/shared/tags';
import { slugify } from '@/shared/schemas/articles';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { Card, PageHeader } from '@/components/ui/page';
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
              <input aria-label={`Cause ${c.code}`} className="min-h-11 flex-1 rounded-md border border-rule-strong bg-paper-raised px-2" value={c.label} onChange={(e) => setList(list.map((x, k) => (k === i ? { ...x, label: e.target.value } : x)))} />
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
        <Button type="submit" variant="secondary" className="self-end">Add</Button>
      </form>
      <Button className="mt-4" busy={save.isPending} onClick={() => save.mutate(list, { onSuccess: (c) => { setList(c); showToast('Causes saved', 'ok'); } })}>
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
                    <label className={`flex min-h-11 items-center gap-2 rounded-full border px-3 ${t.active ? 'border-rule-strong bg-paper-raised' : 'border-dashed border-rule text-ink-faint line-through'}`}>
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
              <Button type="submit" variant="secondary" className="self-end">Add</Button>
            </form>
          </fieldset>
        ))}
      </div>
      <Button className="mt-4" busy={save.isPending} onClick={() => save.mutate(list, { onSuccess: (t) => { setList(t); showToast('Tags saved', 'ok'); } })}>
        Save tags
      </Button>
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
        <TagEditor />
        <CauseEditor />
      </div>
    </div>
  );
}
