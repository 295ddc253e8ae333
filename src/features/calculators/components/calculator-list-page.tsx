// Every calculator, grouped by the job it helps with.
import { Link } from 'react-router';
import { listCalculators } from '@/shared/calculators';
import { paths } from '@/lib/paths';
import { PageHeader } from '@/components/ui/page';

const GROUPS: { title: string; ids: string[] }[] = [
  { title: 'Shot and bead', ids: ['bead', 'dot', 'nozzle-flow', 'nozzle-flow-power-law', 'viscosity-temperature'] },
  { title: 'Valve checks', ids: ['coil-check', 'coil-temperature', 'air-piston-force', 'air-consumption', 'needle-lift', 'placement-drift'] },
  { title: 'Service and reliability', ids: ['service-forecast', 'weibull'] },
  { title: 'Units', ids: ['unit-convert'] },
];

export function CalculatorListPage() {
  const all = listCalculators();
  const grouped = new Set(GROUPS.flatMap((g) => g.ids));
  const groups = [...GROUPS, { title: 'Other', ids: all.map((c) => c.id).filter((id) => !grouped.has(id)) }].filter((g) => g.ids.length);
  return (
    <div>
      <PageHeader title="Calculators" lead="Worked with units and checked against published references. Each one says where its formula holds and where it does not." />
      <div className="space-y-8">
        {groups.map((g) => (
          <section key={g.title} aria-labelledby={`g-${g.title}`}>
            <h2 id={`g-${g.title}`} className="mb-3 text-xl font-semibold">
              {g.title}
            </h2>
            <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
              {g.ids
                .map((id) => all.find((c) => c.id === id))
                .filter((c) => c !== undefined)
                .map((c) => (
                  <li key={c.id}>
                    <Link to={paths.calculator(c.id)} className="block h-full min-h-16 rounded-lg border border-rule bg-paper-raised p-4 hover:border-amber">
                      <span className="block font-semibold">{c.title}</span>
                      <span className="mt-1 block text-sm text-ink-soft">{c.summary}</span>
                    </Link>
                  </li>
                ))}
            </ul>
          </section>
        ))}
      </div>
    </div>
  );
}
