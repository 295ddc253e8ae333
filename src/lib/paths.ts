// Route paths in one place, so links and the router agree.
export const paths = {
  home: '/',
  signIn: '/sign-in',
  invite: (token = ':token') => `/invite/${token}`,
  account: '/account',
  calculators: '/calculators',
  calculator: (id = ':id') => `/calculators/${id}`,
  adminUsers: '/admin/users',
  adminSettings: '/admin/settings',
  articles: '/articles',
  articleNew: '/articles/new',
  article: (id: number | string = ':id') => `/articles/${id}`,
  articleEdit: (id: number | string = ':id') => `/articles/${id}/edit`,
  articleHistory: (id: number | string = ':id') => `/articles/${id}/history`,
} as const;
