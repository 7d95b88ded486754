/** Query keys of the agency administration screens (users, invitations, certifications, profile). */
export type UsersScope = 'agency' | 'manufacturer';

export const agencyKeys = {
  all: ['agency'] as const,
  users: (scope: UsersScope) => [...agencyKeys.all, 'users', scope] as const,
  invitations: () => [...agencyKeys.all, 'invitations'] as const,
  certifications: (userId?: string) => [...agencyKeys.all, 'certifications', userId ?? 'all'] as const,
  expiring: () => [...agencyKeys.all, 'certifications', 'expiring'] as const,
  families: () => [...agencyKeys.all, 'families'] as const,
  profile: () => [...agencyKeys.all, 'profile'] as const,
  invitationPreview: (token: string) => ['invitations', 'preview', token] as const,
};

/** The users list of each side of the portal. */
export const usersPath: Record<UsersScope, string> = { agency: '/api/agency/users', manufacturer: '/api/admin/users' };
