// For people with several roles: choose which role's home to see.
import type { Role } from '@/shared/permissions';
import { ROLE_LABELS } from '@/shared/permissions';

export function RoleSwitcher({ roles, active, onChange }: { roles: Role[]; active: Role; onChange: (r: Role) => void }) {
  if (roles.length < 2) return null;
  return (
    <div role="group" aria-label="Show the home page of" className="flex flex-wrap gap-2">
      {roles.map((r) => (
        <button
          key={r}
          type="button"
          aria-pressed={r === active}
          onClick={() => onChange(r)}
          className={`min-h-11 rounded-full border px-4 font-semibold ${r === active ? 'border-amber bg-amber text-white' : 'border-rule-strong bg-paper-raised text-ink'}`}
        >
          {ROLE_LABELS[r]}
        </button>
      ))}
    </div>
  );
}
