// Where a formula comes from, with how sure we are of it, in words.
import type { Reference } from '@/shared/calculators/types';

const TAG_WORDS: Record<Reference['tag'], string> = {
  checked: 'checked against the source',
  memory: 'from memory, not re-checked',
  derived: 'derived from first principles',
  'common practice': 'rule of thumb of the trade',
};

export function ReferenceList({ references }: { references: Reference[] }) {
  return (
    <ul className="mt-2 space-y-2 text-sm">
      {references.map((r) => (
        <li key={r.text}>
          {r.text}{' '}
          <span className={`ml-1 inline-block rounded px-1.5 py-0.5 text-xs font-semibold ${r.tag === 'common practice' ? 'bg-amber-wash text-amber-deep' : 'bg-paper-sunk text-ink-soft'}`}>
            {TAG_WORDS[r.tag]}
          </span>
        </li>
      ))}
    </ul>
  );
}
