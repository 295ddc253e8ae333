// All routes: public sign-in and invitation pages, and the signed-in app.
import { Suspense } from 'react';
import { createBrowserRouter } from 'react-router';
import { paths } from '@/lib/paths';
import { AppLayout } from '@/components/layouts/app-layout';
import { NotFoundPage, RouteError } from '@/components/errors/route-error';
import { RequirePermission } from './require-permission';
import { lazyPage } from './lazy-page';
import { fetchEarly } from '@/lib/early-fetch';
import { earlyReads, walkIdOf } from '@/shared/early-reads';

// Pages load on first visit, so no page carries another's editors, charts, tables or forms: the
// entry holds React, the router, the query cache and the signed-in frame. The service worker
// precaches the page chunks (all but the editors), so a page first opened without signal still loads.
const AccountPage = lazyPage(() => import('@/features/auth/components/account-page'), 'AccountPage');
const UsersPage = lazyPage(() => import('@/features/admin/components/users-page'), 'UsersPage');
const CalculatorListPage = lazyPage(() => import('@/features/calculators/components/calculator-list-page'), 'CalculatorListPage');
const CalculatorPage = lazyPage(() => import('@/features/calculators/components/calculator-page'), 'CalculatorPage');
const ArticleListPage = lazyPage(() => import('@/features/articles/components/article-list-page'), 'ArticleListPage');
const ArticlePage = lazyPage(() => import('@/features/articles/components/article-page'), 'ArticlePage');
const ArticleEditorPage = lazyPage(() => import('@/features/articles/components/article-editor-page'), 'ArticleEditorPage');
const ArticleHistoryPage = lazyPage(() => import('@/features/articles/components/article-history-page'), 'ArticleHistoryPage');
const SettingsPage = lazyPage(() => import('@/features/admin/components/settings-page'), 'SettingsPage');
const GuideListPage = lazyPage(() => import('@/features/guides/components/guide-list-page'), 'GuideListPage');
const GuidePage = lazyPage(() => import('@/features/guides/components/guide-page'), 'GuidePage');
const GuidePrintPage = lazyPage(() => import('@/features/guides/components/guide-print-page'), 'GuidePrintPage');
const GuideEditorPage = lazyPage(() => import('@/features/guides/components/guide-editor-page'), 'GuideEditorPage');
const AssetsRoutes = lazyPage(() => import('@/features/assets/components/assets-routes'), 'AssetsRoutes');
const CasesRoutes = lazyPage(() => import('@/features/cases/components/cases-routes'), 'CasesRoutes');
const OutboxPage = lazyPage(() => import('@/features/cases/components/outbox-page'), 'OutboxPage');
const AuditPage = lazyPage(() => import('@/features/admin/components/audit-page'), 'AuditPage');
const InsightsRoutes = lazyPage(() => import('@/features/insights/components/insights-routes'), 'InsightsRoutes');
// Home is fetched as soon as the app starts when it is the page asked for, alongside the session
// check, rather than after it.
const HomeRoute = lazyPage(() => import('./routes/home'), 'HomeRoute');
if (window.location.pathname === paths.home) void HomeRoute.preload();
const SignInPage = lazyPage(() => import('@/features/auth/components/sign-in-page'), 'SignInPage');
const InvitePage = lazyPage(() => import('@/features/auth/components/invite-page'), 'InvitePage');
const ResetPasswordPage = lazyPage(() => import('@/features/auth/components/reset-password-page'), 'ResetPasswordPage');
const HelpPage = lazyPage(() => import('./routes/help'), 'HelpPage');
const WalkStartPage = lazyPage(() => import('@/features/walks/components/walk-start-page'), 'WalkStartPage');
// The walk runner likewise, when a walk's address is opened directly (a link, a reload in the
// field), and the walk itself: its first view then waits for one round trip, not three.
const WalkRunnerPage = lazyPage(() => import('@/features/walks/components/walk-runner-page'), 'WalkRunnerPage');
if (walkIdOf(window.location.pathname) !== null) void WalkRunnerPage.preload();
// The session check, and the walk on a walk's address, start now too (src/shared/early-reads.ts).
for (const path of earlyReads(window.location.pathname)) fetchEarly(path);
const WalkSummaryPage = lazyPage(() => import('@/features/walks/components/walk-summary-page'), 'WalkSummaryPage');
const SearchPage = lazyPage(() => import('@/features/search/components/search-page'), 'SearchPage');
const SearchAdminPage = lazyPage(() => import('@/features/search/components/search-page'), 'SearchAdminPage');
if (window.location.pathname === paths.search) void SearchPage.preload();

export const router = createBrowserRouter([
  {
    path: paths.signIn,
    element: (
      <Suspense>
        <SignInPage />
      </Suspense>
    ),
    errorElement: <RouteError />,
  },
  {
    path: paths.invite(),
    element: (
      <Suspense>
        <InvitePage />
      </Suspense>
    ),
    errorElement: <RouteError />,
  },
  {
    path: paths.resetPassword,
    element: (
      <Suspense>
        <ResetPasswordPage />
      </Suspense>
    ),
    errorElement: <RouteError />,
  },
  {
    element: <AppLayout />,
    errorElement: <RouteError />,
    children: [
      {
        errorElement: <RouteError />,
        children: [
          { index: true, element: <HomeRoute /> },
          { path: paths.account, element: <AccountPage /> },
          { path: paths.help, element: <HelpPage /> },
          {
            path: paths.calculators,
            element: (
              <RequirePermission permission="calculators:use">
                <CalculatorListPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.calculator(),
            element: (
              <RequirePermission permission="calculators:use">
                <CalculatorPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.articles,
            element: (
              <RequirePermission permission="articles:read">
                <ArticleListPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.articleNew,
            element: (
              <RequirePermission permission="articles:write">
                <ArticleEditorPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.article(),
            element: (
              <RequirePermission permission="articles:read">
                <ArticlePage />
              </RequirePermission>
            ),
          },
          {
            path: paths.articleEdit(),
            element: (
              <RequirePermission permission="articles:write">
                <ArticleEditorPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.articleHistory(),
            element: (
              <RequirePermission permission="articles:write">
                <ArticleHistoryPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.guides,
            element: (
              <RequirePermission permission="guides:read">
                <GuideListPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.guide(),
            element: (
              <RequirePermission permission="guides:read">
                <GuidePage />
              </RequirePermission>
            ),
          },
          {
            path: paths.guidePrint(),
            element: (
              <RequirePermission permission="guides:read">
                <GuidePrintPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.guideEdit(),
            element: (
              <RequirePermission permission="guides:write">
                <GuideEditorPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.guideWalk(),
            element: (
              <RequirePermission permission="walks:run">
                <WalkStartPage />
              </RequirePermission>
            ),
          },
          { path: paths.walk(), element: <WalkRunnerPage /> },
          { path: paths.walkSummary(), element: <WalkSummaryPage /> },
          {
            path: paths.search,
            element: (
              <RequirePermission permission="search:use">
                <SearchPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.adminSearch,
            element: (
              <RequirePermission permission="search:admin">
                <SearchAdminPage />
              </RequirePermission>
            ),
          },
          {
            path: `${paths.applicators}/*`,
            element: (
              <RequirePermission permission="assets:read">
                <AssetsRoutes />
              </RequirePermission>
            ),
          },
          {
            path: `${paths.cases}/*`,
            element: (
              <RequirePermission permission="cases:read">
                <CasesRoutes />
              </RequirePermission>
            ),
          },
          {
            path: paths.adminOutbox,
            element: (
              <RequirePermission permission="mail:outbox">
                <OutboxPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.adminAudit,
            element: (
              <RequirePermission permission="audit:read">
                <AuditPage />
              </RequirePermission>
            ),
          },
          {
            path: `${paths.insights}/*`,
            element: (
              <RequirePermission permission="insights:read">
                <InsightsRoutes />
              </RequirePermission>
            ),
          },
          {
            path: paths.adminSettings,
            element: (
              <RequirePermission permission="settings:manage">
                <SettingsPage />
              </RequirePermission>
            ),
          },
          {
            path: paths.adminUsers,
            element: (
              <RequirePermission permission="users:manage">
                <UsersPage />
              </RequirePermission>
            ),
          },
          { path: '*', element: <NotFoundPage /> },
        ],
      },
    ],
  },
]);
