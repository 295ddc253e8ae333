// Tag chips grouped by actuation, component and fluid: a filter for lists, a picker for editors.
import { TAG_GROUPS, TAG_GROUP_LABELS } from '@/shared/tags';
import type { TagView } from '@/lib/tags';

export function TagPicker({ tags, value, onChange, legend }: { tags: TagView[]; value: string[]; onChange: (v: string[]) => void; legend: string }) {
  return (
    <fieldset>
      <legend className="mb-2 text-sm font-semibold">{legend}</legend>
      <div className="space-y-2">
        {TAG_GROUPS.map((g) => (
          <div key={g} className="flex flex-wrap items-center gap-2">
            <span className="w-28 shrink-0 text-sm text-ink-soft">{TAG_GROUP_LABELS[g]}</span>
            {tags
              .filter((t) => t.group === g)
              .map((t) => {
                const on = value.includes(t.slug);
                return (
                  <button
                    key={t.slug}
                    type="button"
                    aria-pressed={on}
                    onClick={() => onChange(on ? value.filter((x) => x !== t.slug) : [...value, t.slug])}
                    className={`min-h-11 rounded-full border px-3 text-sm ${on ? 'border-amber bg-amber-wash font-semibold text-amber-deep' : 'border-rule-strong bg-paper-raised'}`}
                  >
                    {t.label}
                  </button>
                );
              })}
          </div>
        ))}
      </div>
    </fieldset>
  );
}

export function TagList({ slugs, tags }: { slugs: string[]; tags: TagView[] }) {
  if (!slugs.length) return null;
  return (
    <ul className="flex flex-wrap gap-1" aria-label="Tags">
      {slugs.map((s) => (
        <li key={s} className="rounded-full bg-paper-sunk px-2 py-0.5 text-xs text-ink-soft">
          {tags.find((t) => t.slug === s)?.label ?? s}
        </li>
      ))}
    </ul>
  );
}
