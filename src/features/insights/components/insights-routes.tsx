// The manager's insights pages under /insights: recurring causes, the service forecast, guide
// effectiveness and reliability, as tabs over descendant routes.
import { NavLink, Route, Routes } from 'react-router';
import { PageHeader } from '@/components/ui/page';
import { NotFoundPage } from '@/components/errors/route-error';
import { CausesPage } from './causes-page';
import { ForecastPage } from './forecast-page';
import { GuidesPage } from './guides-page';
import { ReliabilityPage } from './reliability-page';

const TABS = [
  ['', 'Recurring causes'],
  ['forecast', 'Service forecast'],
  ['guides', 'Guide effectiveness'],
  ['reliability', 'Reliability'],
] as const;

export function InsightsRoutes() {
  return (
    <div>
      <PageHeader title="Insights" lead="What keeps failing and where, which valves need parts soon, which guides fix things, and how long parts last." />
      <nav aria-label="Insights" className="mb-5 flex flex-wrap gap-1 border-b border-rule">
        {TABS.map(([to, label]) => (
          <NavLink
            key={to}
            to={to ? `/insights/${to}` : '/insights'}
            end
            className={({ isActive }) =>
              `-mb-px flex min-h-11 items-center border-b-2 px-3 font-semibold ${isActive ? 'border-amber text-amber-deep' : 'border-transparent text-ink-soft hover:text-ink'}`
            }
          >
            {label}
          </NavLink>
        ))}
      </nav>
      <Routes>
        <Route index element={<CausesPage />} />
        <Route path="forecast" element={<ForecastPage />} />
        <Route path="guides" element={<GuidesPage />} />
        <Route path="reliability" element={<ReliabilityPage />} />
        <Route path="*" element={<NotFoundPage />} />
      </Routes>
    </div>
  );
}
