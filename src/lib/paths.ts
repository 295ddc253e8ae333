// Route paths in one place, so links and the router agree.
export const paths = {
  home: '/',
  signIn: '/sign-in',
  invite: (token = ':token') => `/invite/${token}`,
  account: '/account',
  calculators: '/calculators',
  calculator: (id = ':id') => `/calculators/${id}`,
  adminUsers: '/admin/users',
} as const;
