// Calculators as large tiles, the ones a role reaches for most first.
import { Link } from 'react-router';
import { listCalculators } from '@/shared/calculators/registry';
import type { Role } from '@/shared/permissions';
import { paths } from '@/lib/paths';
import { Icon } from '@/components/ui/icons';

const FIRST: Record<Role, string[]> = {
  technician: ['coil-check', 'air-piston-force', 'placement-drift', 'unit-convert', 'viscosity-temperature', 'dot'],
  support: ['unit-convert', 'coil-check', 'air-piston-force', 'placement-drift', 'viscosity-temperature', 'nozzle-flow'],
  author: ['nozzle-flow', 'coil-check', 'air-piston-force', 'needle-lift', 'viscosity-temperature', 'bead'],
  manager: ['service-forecast', 'weibull', 'bead', 'dot', 'air-consumption', 'unit-convert'],
  admin: ['unit-convert', 'service-forecast', 'coil-check', 'bead', 'dot', 'nozzle-flow'],
};

export function CalculatorTiles({ role, limit = 6 }: { role: Role; limit?: number }) {
  const all = listCalculators();
  const order = FIRST[role];
  const picked = order
    .map((id) => all.find((c) => c.id === id))
    .filter((c) => c !== undefined)
    .slice(0, limit);
  return (
    <div>
      <ul className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3">
        {picked.map((c) => (
          <li key={c.id}>
            <Link to={paths.calculator(c.id)} className="flex min-h-16 items-start gap-3 rounded-lg border border-rule bg-paper-raised p-4 hover:border-amber">
              <Icon.gauge className="mt-0.5 shrink-0 text-amber-deep" width={24} height={24} />
              <span>
                <span className="block font-semibold">{c.title}</span>
                <span className="block text-sm text-ink-soft">{c.summary}</span>
              </span>
            </Link>
          </li>
        ))}
      </ul>
      <Link to={paths.calculators} className="mt-3 inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
        All {all.length} calculators
      </Link>
    </div>
  );
}
