// The one table of who may do what. The server's route guards enforce it; the client reads it
// only to hide actions the server would refuse.

export const ROLES = ['admin', 'author', 'technician', 'support', 'manager'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  author: 'Author',
  technician: 'Technician',
  support: 'Support desk',
  manager: 'Manager',
};

const everyone: readonly Role[] = ROLES;

export const PERMISSIONS = {
  /** Run the engineering calculators. */
  'calculators:use': everyone,
  /** Read published articles. */
  'articles:read': everyone,
  /** Write and edit articles, submit them for review, archive them. */
  'articles:write': ['author'],
  /** Approve or send back another author's article. */
  'articles:review': ['author'],
  /** See published guides (to start walks and read them). */
  'guides:read': everyone,
  /** Write guides: drafts, submit, import, export, retire. */
  'guides:write': ['author'],
  /** Approve or send back another author's guide version. */
  'guides:review': ['author'],
  /** Edit the organisation's list of causes. */
  'causes:manage': ['admin', 'author'],
  /** Walk a guide and record what was found. */
  'walks:run': ['technician', 'support', 'author'],
  /** See colleagues' walks (shared links, the support desk's live view, managers' drill-downs). */
  'walks:view-others': ['support', 'manager', 'author', 'admin'],
  /** Flag a step as wrong or unclear. */
  'guides:flag': ['technician', 'support', 'author'],
  /** Search guides and articles. */
  'search:use': everyone,
  /** See the search engine's state, edit trade synonyms, rebuild the index. */
  'search:admin': ['admin'],
  /** See sites, lines, applicators, their counters and service history. */
  'assets:read': everyone,
  /** Create and edit sites, lines and applicators; import them from CSV; print labels. */
  'assets:manage': ['admin', 'author'],
  /** Add counter readings and service events. */
  'assets:record': ['admin', 'author', 'technician'],
  /** See cases: support and managers all, authors and admins handed-off ones, technicians their own. */
  'cases:read': everyone,
  /** Log calls and work cases: notes, status, walks with the caller, hand-off, summaries. */
  'cases:work': ['support'],
  /** See every e-mail Beadpath sent or tried to send. */
  'mail:outbox': ['admin'],
  /** Recurring causes, reliability, service forecasts and guide effectiveness. */
  'insights:read': ['manager', 'admin', 'author'],
  /** See the audit log of who changed what. */
  'audit:read': ['admin'],
  /** Upload photos and documents (articles, walks, cases). */
  'files:upload': ['admin', 'author', 'technician', 'support'],
  /** Edit the organisation's tag lists. */
  'tags:manage': ['admin'],
  /** List users, invite, change roles, deactivate. */
  'users:manage': ['admin'],
  /** Organisation-wide settings. */
  'settings:manage': ['admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function can(roles: readonly Role[] | undefined | null, permission: Permission): boolean {
  if (!roles) return false;
  const allowed = PERMISSIONS[permission] as readonly Role[];
  return roles.some((r) => allowed.includes(r));
}

export function isRole(value: string): value is Role {
  return (ROLES as readonly string[]).includes(value);
}
