// The admin's first-run checklist on the home page: four set-up steps, each ticked from the
// organisation's real data rather than from a flag, so it stays right when someone else does a
// step. Hidden once everything is done.
import { Link } from 'react-router';
import { paths } from '@/lib/paths';
import { Card } from '@/components/ui/page';
import { Skeleton } from '@/components/ui/feedback';
import { useSites, useApplicators } from '@/features/assets/api/assets';
import { useUsers } from '@/features/admin/api/users';
import { useGuides } from '@/features/guides/api/guides';

interface Step {
  label: string;
  hint: string;
  to: string;
  done: boolean | undefined;
}

export function FirstRunChecklist() {
  const sites = useSites();
  const users = useUsers();
  const applicators = useApplicators({});
  const guides = useGuides({ status: 'published' });
  const steps: Step[] = [
    { label: 'Add a site', hint: 'Where your lines and valves are.', to: `${paths.applicators}/sites`, done: sites.data && sites.data.length > 0 },
    // The admin counts as one person; the step is about bringing in the others.
    { label: 'Invite people', hint: 'Technicians, authors, support staff and managers.', to: paths.adminUsers, done: users.data && users.data.length > 1 },
    { label: 'Import applicators', hint: 'From a spreadsheet (CSV), with their sites and lines.', to: `${paths.applicators}/import`, done: applicators.data && applicators.data.total > 0 },
    { label: 'Publish a first guide', hint: 'Technicians walk published guides from their home page.', to: paths.guides, done: guides.data && guides.data.length > 0 },
  ];
  if ([sites, users, applicators, guides].some((q) => q.isPending)) return <Skeleton className="h-40 w-full" />;
  // A step whose count could not be read is shown as not done: the link still helps.
  if (steps.every((s) => s.done)) return null;
  const doneCount = steps.filter((s) => s.done).length;

  return (
    <Card>
      <h2 id="first-run-heading" className="text-lg font-semibold">
        Set up Beadpath
      </h2>
      <p className="mt-1 text-ink-soft">
        {doneCount} of {steps.length} done. This list goes away when all four are.
      </p>
      <ol aria-labelledby="first-run-heading" className="mt-3 space-y-2">
        {steps.map((s) => (
          <li key={s.label} className="flex items-start gap-3">
            <span
              aria-hidden
              className={`mt-1 inline-flex h-6 w-6 shrink-0 items-center justify-center rounded-full border-2 text-sm font-bold ${s.done ? 'border-amber bg-amber text-paper' : 'border-rule-strong text-transparent'}`}
            >
              ✓
            </span>
            <span>
              {s.done ? (
                <span className="font-semibold text-ink-soft line-through">{s.label}</span>
              ) : (
                <Link to={s.to} className="font-semibold text-amber-deep underline">
                  {s.label}
                </Link>
              )}
              <span className="sr-only">{s.done ? ' (done)' : ' (to do)'}</span>
              <span className="block text-sm text-ink-soft">{s.hint}</span>
            </span>
          </li>
        ))}
      </ol>
    </Card>
  );
}
