// All routes: public sign-in and invitation pages, and the signed-in app.
import { createBrowserRouter } from 'react-router';
import { paths } from '@/lib/paths';
import { AppLayout } from '@/components/layouts/app-layout';
import { NotFoundPage, RouteError } from '@/components/errors/route-error';
import { SignInPage } from '@/features/auth/components/sign-in-page';
import { InvitePage } from '@/features/auth/components/invite-page';
import { ResetPasswordPage } from '@/features/auth/components/reset-password-page';
import { AccountPage } from '@/features/auth/components/account-page';
import { UsersPage } from '@/features/admin/components/users-page';
import { CalculatorListPage } from '@/features/calculators/components/calculator-list-page';
import { CalculatorPage } from '@/features/calculators/components/calculator-page';
import { ArticleListPage } from '@/features/articles/components/article-list-page';
import { ArticlePage } from '@/features/articles/components/article-page';
import { ArticleEditorPage } from '@/features/articles/components/article-editor-page';
import { ArticleHistoryPage } from '@/features/articles/components/article-history-page';
import { SettingsPage } from '@/features/admin/components/settings-page';
import { GuideListPage } from '@/features/guides/components/guide-list-page';
import { GuidePage } from '@/features/guides/components/guide-page';
import { GuideEditorPage } from '@/features/guides/components/guide-editor-page';
import { WalkStartPage } from '@/features/walks/components/walk-start-page';
import { WalkRunnerPage } from '@/features/walks/components/walk-runner-page';
import { WalkSummaryPage } from '@/features/walks/components/walk-summary-page';
import { SearchAdminPage, SearchPage } from '@/features/search/components/search-page';
import { AssetsRoutes } from '@/features/assets/components/assets-routes';
import { CasesRoutes, OutboxPage } from '@/features/cases/components/cases-routes';
import { InsightsRoutes } from '@/features/insights/components/insights-routes';
import { HomeRoute } from './routes/home';
import { RequirePermission } from './require-permission';

export const router = createBrowserRouter([
  { path: paths.signIn, element: <SignInPage />, errorElement: <RouteError /> },
  { path: paths.invite(), element: <InvitePage />, errorElement: <RouteError /> },
  { path: paths.resetPassword, element: <ResetPasswordPage />, errorElement: <RouteError /> },
  {
    element: <AppLayout />,
    errorElement: <RouteError />,
    children: [
      {
        errorElement: <RouteError />,
        children: [
          { index: true, element: <HomeRoute /> },
          { path: paths.account, element: <AccountPage /> },
          { path: paths.calculators, element: <RequirePermission permission="calculators:use"><CalculatorListPage /></RequirePermission> },
          { path: paths.calculator(), element: <RequirePermission permission="calculators:use"><CalculatorPage /></RequirePermission> },
          { path: paths.articles, element: <RequirePermission permission="articles:read"><ArticleListPage /></RequirePermission> },
          { path: paths.articleNew, element: <RequirePermission permission="articles:write"><ArticleEditorPage /></RequirePermission> },
          { path: paths.article(), element: <RequirePermission permission="articles:read"><ArticlePage /></RequirePermission> },
          { path: paths.articleEdit(), element: <RequirePermission permission="articles:write"><ArticleEditorPage /></RequirePermission> },
          { path: paths.articleHistory(), element: <RequirePermission permission="articles:write"><ArticleHistoryPage /></RequirePermission> },
          { path: paths.guides, element: <RequirePermission permission="guides:read"><GuideListPage /></RequirePermission> },
          { path: paths.guide(), element: <RequirePermission permission="guides:read"><GuidePage /></RequirePermission> },
          { path: paths.guideEdit(), element: <RequirePermission permission="guides:write"><GuideEditorPage /></RequirePermission> },
          { path: paths.guideWalk(), element: <RequirePermission permission="walks:run"><WalkStartPage /></RequirePermission> },
          { path: paths.walk(), element: <WalkRunnerPage /> },
          { path: paths.walkSummary(), element: <WalkSummaryPage /> },
          { path: paths.search, element: <RequirePermission permission="search:use"><SearchPage /></RequirePermission> },
          { path: paths.adminSearch, element: <RequirePermission permission="search:admin"><SearchAdminPage /></RequirePermission> },
          { path: `${paths.applicators}/*`, element: <RequirePermission permission="assets:read"><AssetsRoutes /></RequirePermission> },
          { path: `${paths.cases}/*`, element: <RequirePermission permission="cases:read"><CasesRoutes /></RequirePermission> },
          { path: paths.adminOutbox, element: <RequirePermission permission="mail:outbox"><OutboxPage /></RequirePermission> },
          { path: `${paths.insights}/*`, element: <RequirePermission permission="insights:read"><InsightsRoutes /></RequirePermission> },
          { path: paths.adminSettings, element: <RequirePermission permission="settings:manage"><SettingsPage /></RequirePermission> },
          { path: paths.adminUsers, element: <RequirePermission permission="users:manage"><UsersPage /></RequirePermission> },
          { path: '*', element: <NotFoundPage /> },
        ],
      },
    ],
  },
]);
