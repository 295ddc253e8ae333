// Home: what each role does next. Composes features; each role's home grows as features land.
import { useState, type ReactNode } from 'react';
import { Link } from 'react-router';
import type { Role } from '@/shared/permissions';
import { activeRole, setActiveRole, useMe } from '@/lib/auth';
import { paths } from '@/lib/paths';
import { RoleSwitcher } from '@/features/home/components/role-switcher';
import { CalculatorTiles } from '@/features/calculators/components/calculator-tiles';
import { Card } from '@/components/ui/page';
import { Skeleton } from '@/components/ui/feedback';
import { useGuides } from '@/features/guides/api/guides';
import { useWalks } from '@/features/walks/api/walks';
import { useArticles } from '@/features/articles/api/articles';
import { Icon } from '@/components/ui/icons';
import { ButtonLink } from '@/components/ui/button';
import { ArticleShortList } from '@/features/articles/components/article-short-list';
import { OpenWalks } from '@/features/walks/components/open-walks';
import { SymptomChips } from '@/features/guides/components/symptom-chips';
import { SymptomSearch } from '@/features/search/components/symptom-search';
import { GuideFeedback } from '@/features/guides/components/guide-feedback';
// Straight from their files: cases-routes pulls in the case table and its table library.
import { CaseQueue } from '@/features/cases/components/case-queue';
import { NoticesList } from '@/features/cases/components/notices-list';
import { ManagerSummary } from '@/features/insights/components/manager-summary';
import { FirstRunChecklist } from './first-run-checklist';

const LEADS: Record<Role, string> = {
  technician: 'Tap what you see to walk its guide, or work out a reading with a calculator.',
  author: 'Reviews waiting for you, your drafts, and the numbers to check before you write them down.',
  support: 'Log each call, walk a guide with the caller, hand off or resolve, and send the summary.',
  manager: 'What keeps failing and where, what is due for service, and which guides work.',
  admin: 'Set Beadpath up for your organisation.',
};

export function HomeRoute() {
  const { data: me } = useMe();
  const [role, setRole] = useState<Role | null>(null);
  if (!me) return null;
  const current = role ?? activeRole(me.user);
  const choose = (r: Role) => {
    setActiveRole(r);
    setRole(r);
  };

  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold sm:text-3xl">Good to see you, {me.user.name.split(' ')[0]}</h1>
          <p className="mt-1 text-ink-soft">{LEADS[current]}</p>
        </div>
        <RoleSwitcher roles={me.user.roles} active={current} onChange={choose} />
      </div>
      <NoticesList />
      {current === 'support' ? <CaseQueue /> : null}
      {current === 'manager' ? <ManagerSummary /> : null}
      {current === 'admin' ? <FirstRunChecklist /> : null}
      {current === 'admin' ? (
        <Card>
          <h2 className="text-lg font-semibold">People</h2>
          <p className="mt-1 text-ink-soft">Invite technicians, authors, support staff and managers, and set their roles.</p>
          <Link to={paths.adminUsers} className="mt-3 inline-flex min-h-11 items-center gap-2 font-semibold text-amber-deep underline">
            <Icon.users /> Manage users
          </Link>
        </Card>
      ) : null}
      {current === 'author' ? (
        <div className="space-y-4">
          <div className="flex flex-wrap gap-2">
            <ButtonLink to={paths.guides}>Guides</ButtonLink>
            <ButtonLink variant="secondary" to={paths.articleNew}>
              New article
            </ButtonLink>
          </div>
          <GuideFeedback />
          <div className="grid gap-4 lg:grid-cols-2">
            <ArticleShortList title="Waiting for your review" filters={{ status: 'review-queue' }} empty="No article is waiting for your review." />
            <ArticleShortList title="Your articles" filters={{ status: 'all', mine: '1' }} empty="You have not written an article yet." />
          </div>
        </div>
      ) : null}
      {current === 'technician' || current === 'support' ? (
        <FieldHome withOpenWalks={current === 'technician'}>
          <CalculatorsSection role={current} />
        </FieldHome>
      ) : (
        <CalculatorsSection role={current} />
      )}
    </div>
  );
}

function CalculatorsSection({ role }: { role: Role }) {
  return (
    <section aria-labelledby="calc-heading">
      <h2 id="calc-heading" className="mb-3 text-xl font-semibold">
        Calculators
      </h2>
      <CalculatorTiles role={role} />
    </section>
  );
}

/**
 * The field home (symptoms, open walks, newest articles, calculators) appears in one piece once
 * the lists that size it have arrived: drawn piece by piece, the chips and the open walks pushed
 * everything under them down the phone's screen as they came in.
 */
function FieldHome({ withOpenWalks, children }: { withOpenWalks: boolean; children: ReactNode }) {
  const guides = useGuides({});
  const walks = useWalks({ mine: '1', status: 'open' }, { enabled: withOpenWalks });
  const articles = useArticles({});
  const loading = guides.isPending || (withOpenWalks && walks.isPending) || articles.isPending;
  // The search box keeps its place (and what is typed in it) while the lists arrive.
  return (
    <>
      <div className="space-y-6">
        <SymptomSearch />
        {loading ? (
          <div className="min-h-dvh space-y-6" role="status">
            <span className="sr-only">Loading the symptoms and your open walks…</span>
            <Skeleton className="h-48 w-full" />
            <Skeleton className="h-32 w-full" />
          </div>
        ) : (
          <>
            <SymptomChips />
            {withOpenWalks ? <OpenWalks /> : null}
          </>
        )}
      </div>
      {loading ? null : (
        <>
          <ArticleShortList title="Newest articles" filters={{}} empty="No article has been published yet." limit={4} />
          {children}
        </>
      )}
    </>
  );
}
