import { eq, sql } from 'drizzle-orm';
import { tx } from '../../db/client';
import { users } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { writeAudit } from '../../lib/audit';
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../../lib/errors';
import { todayFor } from '../../lib/business-day';
import { agencyRoles, manufacturerRoles, roleLabels, type Role } from '@shared/permissions/ability';
import type { UpdateUserBody, UserListItem } from '@shared/schemas/admin';
import { countOtherActive, findVisibleUser, listUsers } from './agency.queries';

/** Which side of the portal a users page serves: its roles and the admin role that must remain. */
export type UserScope = 'agency' | 'manufacturer';

export const scopeRoles: Record<UserScope, readonly Role[]> = { agency: agencyRoles, manufacturer: manufacturerRoles };
const adminRole: Record<UserScope, Role> = { agency: 'agency_admin', manufacturer: 'manufacturer_admin' };
const orgWord: Record<UserScope, string> = { agency: 'service agency', manufacturer: 'manufacturer' };

/** The caller must be an admin of an organisation of this kind (403 otherwise). */
export function requireUserAdmin(ctx: RequestContext, scope: UserScope): void {
  const kind = scope === 'agency' ? 'agency' : 'manufacturer';
  if (ctx.user.organisationKind !== kind || ctx.user.role !== adminRole[scope] || !ctx.ability.can('update', 'User')) {
    throw new ForbiddenError(scope === 'agency' ? 'Only an agency admin manages the users of a service agency.' : 'Only a manufacturer admin manages the manufacturer users.');
  }
}

export function roleRefusal(scope: UserScope): ValidationError {
  const allowed = scopeRoles[scope].map((r) => roleLabels[r].toLowerCase()).join(' or ');
  return new ValidationError('That role cannot be given here.', { role: `A ${orgWord[scope]} user can only be a ${allowed}.` });
}

export type UsersService = ReturnType<typeof createUsersService>;

export function createUsersService(deps: AppDeps) {
  const { db, clock } = deps;
  return {
    list(ctx: RequestContext, scope: UserScope): UserListItem[] {
      requireUserAdmin(ctx, scope);
      return listUsers(db, ctx.ability, ctx.user.organisationId, todayFor(db, clock, ctx.user.organisationId));
    },

    /**
     * Role change and (de)activation. Both move the session version on, so the user's sessions
     * end at their next request. The last active admin of the organisation stays an active admin.
     */
    update(ctx: RequestContext, scope: UserScope, id: string, body: UpdateUserBody, ip: string): UserListItem {
      requireUserAdmin(ctx, scope);
      if (body.role !== undefined && !scopeRoles[scope].includes(body.role)) throw roleRefusal(scope);
      tx(db, (t) => {
        const target = findVisibleUser(t, ctx.ability, 'update', id);
        if (!target || target.organisationId !== ctx.user.organisationId) throw new NotFoundError('No such user.');
        const role = body.role ?? target.role;
        const active = body.active ?? target.active;
        if (role === target.role && active === target.active) return;
        const admin = adminRole[scope];
        if (target.role === admin && target.active && (role !== admin || !active) && countOtherActive(t, target.organisationId, admin, target.id) === 0) {
          throw new ConflictError(
            `${target.name} is the last active ${roleLabels[admin].toLowerCase()} of this ${orgWord[scope]}. Make another user an ${roleLabels[admin].toLowerCase()} first.`,
            'last_admin',
          );
        }
        const now = clock.now().toISOString();
        t.update(users)
          .set({ role, active, sessionVersion: sql`${users.sessionVersion} + 1`, updatedAt: now })
          .where(eq(users.id, target.id))
          .run();
        const detail: Record<string, unknown> = {};
        if (role !== target.role) detail.role = { from: target.role, to: role };
        if (active !== target.active) detail.active = { from: target.active, to: active };
        writeAudit(t, clock, {
          actorId: ctx.user.id,
          organisationId: ctx.user.organisationId,
          action: active !== target.active ? (active ? 'user.reactivate' : 'user.deactivate') : 'user.change_role',
          recordType: 'User',
          recordId: target.id,
          outcome: 'success',
          ip,
          detail,
        });
      });
      const item = listUsers(db, ctx.ability, ctx.user.organisationId, todayFor(db, clock, ctx.user.organisationId)).find((u) => u.id === id);
      if (!item) throw new NotFoundError('No such user.');
      return item;
    },
  };
}
