// The navigation entries and who sees them (read from the permission table).
import type { Permission } from '@/shared/permissions';
import { paths } from '@/lib/paths';
import { Icon } from '@/components/ui/icons';

export interface NavItem {
  to: string;
  label: string;
  icon: (typeof Icon)[keyof typeof Icon];
  permission?: Permission;
}

export const NAV: NavItem[] = [
  // Most used first: the header shows the first few and puts the rest under More.
  { to: paths.home, label: 'Home', icon: Icon.home },
  { to: paths.guides, label: 'Guides', icon: Icon.guide, permission: 'guides:read' },
  { to: paths.applicators, label: 'Applicators', icon: Icon.valve, permission: 'assets:read' },
  { to: paths.cases, label: 'Cases', icon: Icon.phone, permission: 'cases:read' },
  { to: paths.insights, label: 'Insights', icon: Icon.chart, permission: 'insights:read' },
  { to: paths.calculators, label: 'Calculators', icon: Icon.calculator, permission: 'calculators:use' },
  { to: paths.articles, label: 'Articles', icon: Icon.book, permission: 'articles:read' },
  { to: paths.adminUsers, label: 'Users', icon: Icon.users, permission: 'users:manage' },
  { to: paths.adminSettings, label: 'Settings', icon: Icon.settings, permission: 'settings:manage' },
  { to: paths.adminSearch, label: 'Search engine', icon: Icon.search, permission: 'search:admin' },
  { to: paths.adminOutbox, label: 'Outbox', icon: Icon.mail, permission: 'mail:outbox' },
  { to: paths.adminAudit, label: 'Audit log', icon: Icon.book, permission: 'audit:read' },
];
