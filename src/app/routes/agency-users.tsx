import { ApprovalLimitsPanel } from '@/features/admin/components/approval-limits-panel';
import { useCallback, useState } from 'react';
import { useSearchParams } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { agencyRoles, manufacturerRoles, roleLabels, type Role } from '@shared/permissions/ability';
import type { UserListItem } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Skeleton } from '@/components/ui/skeleton';
import { errorMessage, isApiError } from '@/lib/api-client';
import { cx } from '@/lib/cx';
import { formatDate } from '@/lib/format';
import { authQueries, useSession } from '@/features/auth/api/get-me';
import type { UsersScope } from '@/features/agency/api/agency-keys';
import { usersQuery, useUsers } from '@/features/agency/api/get-users';
import { useUpdateUser } from '@/features/agency/api/update-user';
import { invitationsQuery, useInvitations } from '@/features/agency/api/get-invitations';
import { useExpiringCertifications } from '@/features/agency/api/get-expiring-certifications';
import { useAgencyProfile } from '@/features/agency/api/get-agency-profile';
import { UsersTable } from '@/features/agency/components/users-table';
import { InviteForm } from '@/features/agency/components/invite-form';
import { InvitationsList } from '@/features/agency/components/invitations-list';
import { CertificationsPanel } from '@/features/agency/components/certifications-panel';
import { AgencyProfileForm } from '@/features/agency/components/agency-profile-form';
import { Modal } from '@/components/ui/modal';

const scopeOf = (kind: 'agency' | 'manufacturer' | undefined): UsersScope => (kind === 'manufacturer' ? 'manufacturer' : 'agency');

export const agencyUsersLoader = (queryClient: QueryClient) => async () => {
  const me = queryClient.getQueryData(authQueries.me().queryKey);
  const scope = scopeOf(me?.organisation.kind);
  try {
    await Promise.all([queryClient.ensureQueryData(usersQuery(scope)), queryClient.ensureQueryData(invitationsQuery())]);
  } catch (e) {
    if (isApiError(e, 401)) throw e;
  }
  return null;
};

type Tab = 'people' | 'profile';

/** Users of the signed-in admin's organisation; for a service agency also certifications and the agency profile. */
export function AgencyUsersRoute() {
  const me = useSession();
  const scope = scopeOf(me?.organisation.kind);
  const [params, setParams] = useSearchParams();
  const tab: Tab = scope === 'agency' && params.get('tab') === 'profile' ? 'profile' : 'people';
  return (
    <div className="space-y-5">
      <title>{scope === 'agency' ? 'Users and agency · Fieldproof' : 'Manufacturer users · Fieldproof'}</title>
      <div>
        <h1 className="text-2xl font-semibold text-ink-900">{scope === 'agency' ? 'Users and agency' : 'Manufacturer users'}</h1>
        <p className="text-sm text-ink-600">{me?.organisation.name}</p>
      </div>
      {scope === 'agency' && (
        <div role="tablist" aria-label="Sections" className="flex gap-1 border-b border-ink-200">
          {(['people', 'profile'] as const).map((t) => (
            <button
              key={t}
              role="tab"
              type="button"
              aria-selected={tab === t}
              onClick={() => setParams(t === 'people' ? {} : { tab: t })}
              className={cx('-mb-px border-b-2 px-3 py-2 text-sm font-medium', tab === t ? 'border-ink-700 text-ink-900' : 'border-transparent text-ink-600 hover:text-ink-900')}
            >
              {t === 'people' ? 'People and certifications' : 'Agency profile'}
            </button>
          ))}
        </div>
      )}
      {tab === 'people' ? <People scope={scope} currentUserId={me?.user.id} limits={me?.user.role === 'manufacturer_admin'} /> : <Profile />}
    </div>
  );
}

function People({ scope, currentUserId, limits = false }: { scope: UsersScope; currentUserId: string | undefined; limits?: boolean }) {
  const users = useUsers(scope);
  const invitations = useInvitations();
  const update = useUpdateUser(scope);
  const roles: readonly Role[] = scope === 'agency' ? agencyRoles : manufacturerRoles;
  const [inviting, setInviting] = useState(false);
  const [certsFor, setCertsFor] = useState<UserListItem | null>(null);
  const [note, setNote] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);

  const change = useCallback(
    (user: UserListItem, body: { role?: Role; active?: boolean }, done: string) => {
      setNote(null);
      update.mutate({ id: user.id, body }, { onSuccess: () => setNote({ tone: 'success', text: done }), onError: (e) => setNote({ tone: 'error', text: errorMessage(e) }) });
    },
    [update],
  );
  const onChangeRole = useCallback(
    (u: UserListItem, role: Role) => change(u, { role }, `${u.name} is now ${roleLabels[role].toLowerCase()}. Their sessions ended; they sign in again to continue.`),
    [change],
  );
  const onToggleActive = useCallback(
    (u: UserListItem) =>
      change(u, { active: !u.active }, u.active ? `${u.name} is deactivated and was signed out everywhere.` : `${u.name} is active again and can sign in.`),
    [change],
  );

  return (
    <div className="space-y-5">
      {scope === 'agency' && <ExpiringNotice />}
      {note && <Alert tone={note.tone}>{note.text}</Alert>}
      <Card>
        <CardHeader
          title="People"
          description={scope === 'agency' ? 'Technicians and agency admins. Deactivating ends their sessions at once.' : 'Reviewers, accountants and admins. Deactivating ends their sessions at once.'}
          actions={<Button onClick={() => setInviting(true)}>Invite someone</Button>}
        />
        {users.isPending && <Skeleton className="m-4 h-40" />}
        {users.isError && (
          <CardBody>
            <Alert tone="error">{errorMessage(users.error)}</Alert>
          </CardBody>
        )}
        {users.data && (
          <UsersTable
            items={users.data}
            roles={roles}
            currentUserId={currentUserId}
            pendingId={update.isPending ? (update.variables?.id ?? null) : null}
            onChangeRole={onChangeRole}
            onToggleActive={onToggleActive}
            onCertifications={scope === 'agency' ? setCertsFor : undefined}
          />
        )}
      </Card>
      {scope === 'manufacturer' && limits && <ApprovalLimitsPanel />}
      <Card>
        <CardHeader title="Invitations waiting for an answer" />
        {invitations.isError && (
          <CardBody>
            <Alert tone="error">{errorMessage(invitations.error)}</Alert>
          </CardBody>
        )}
        {invitations.data && <InvitationsList items={invitations.data} />}
      </Card>
      <Modal open={inviting} onClose={() => setInviting(false)} title="Invite someone">
        <InviteForm
          scope={scope}
          roles={roles}
          onDone={(email) => {
            setInviting(false);
            setNote({ tone: 'success', text: `An invitation is on its way to ${email}.` });
          }}
        />
      </Modal>
      <Modal open={certsFor !== null} onClose={() => setCertsFor(null)} title={certsFor ? `Certifications of ${certsFor.name}` : 'Certifications'}>
        {certsFor && <CertificationsPanel user={certsFor} />}
      </Modal>
    </div>
  );
}

function ExpiringNotice() {
  const expiring = useExpiringCertifications();
  if (!expiring.data || expiring.data.length === 0) return null;
  return (
    <Alert tone="warning" title="Certificates ending within 30 days">
      <ul className="list-disc pl-5">
        {expiring.data.map((c) => (
          <li key={c.id}>
            {c.userName}: {c.familyName}, ends {formatDate(c.validTo)} ({c.daysLeft} days)
          </li>
        ))}
      </ul>
    </Alert>
  );
}

function Profile() {
  const profile = useAgencyProfile();
  return (
    <Card>
      <CardHeader title="Agency profile" description="Travel on claims is measured from the base coordinates." />
      <CardBody>
        {profile.isPending && <Skeleton className="h-64" />}
        {profile.isError && <Alert tone="error">{errorMessage(profile.error)}</Alert>}
        {profile.data && <AgencyProfileForm key={profile.data.id} profile={profile.data} />}
      </CardBody>
    </Card>
  );
}
