import type { Role } from '../../../shared/schemas/auth.schema';
import type { InviteRequest, Person } from '../../../shared/schemas/people.schema';
import { Membership, type User } from '../../db/entities';
import { conflict, forbidden, notFound } from '../../http/errors';
import type { Logger } from '../../lib/logger';
import type { AuditService } from '../audit/audit.service';
import type { AuthService } from '../auth/auth.service';
import type { NotificationsService } from '../notifications/notifications.service';
import type { PeopleRepository } from './people.repository';

/** A manager manages the hands and planners of their own farm; an admin manages everyone. */
function mayManage(actorRole: Role, targetRole: Membership['role']): boolean {
  if (actorRole === 'admin') return true;
  return actorRole === 'manager' && (targetRole === 'hand' || targetRole === 'planner');
}

const present = (m: Membership, u: User): Person => ({
  userId: u.id,
  email: u.email,
  name: u.name,
  role: m.role,
  active: u.active,
  invited: u.passwordHash === null,
  lastLoginAt: u.lastLoginAt?.toISOString() ?? null,
  memberSince: m.createdAt.toISOString(),
});

export class PeopleService {
  constructor(
    private readonly repo: PeopleRepository,
    private readonly auth: AuthService,
    private readonly notifications: NotificationsService,
    private readonly audit: AuditService,
    private readonly options: { publicUrl: string },
    private readonly logger: Logger,
  ) {}

  async list(farmId: string): Promise<Person[]> {
    return (await this.repo.members(farmId)).map(({ membership, user }) => present(membership, user));
  }

  /** Adds a person to the farm (creating the account if new) and e-mails a single-use link to set a password. */
  async invite(farmId: string, farmName: string, input: InviteRequest, actor: { id: string; role: Role }): Promise<Person> {
    if (!mayManage(actor.role, input.role)) throw forbidden('A manager invites hands and planners; an admin invites managers.');
    const email = input.email.trim().toLowerCase();
    const { membership, user, isNew } = await this.repo.transaction(async (m) => {
      let user = await this.repo.userByEmail(m, email);
      const isNew = !user;
      user ??= await this.repo.createUser(m, { email, name: input.name, locale: input.locale });
      const existing = await m.getRepository(Membership).findOneBy({ farmId, userId: user.id });
      if (existing) throw conflict('This person is already on the farm.', { fieldErrors: { email: ['already on this farm'] } }, 'already_member');
      const membership = await this.repo.addMembership(m, farmId, user.id, input.role);
      return { membership, user, isNew };
    });
    await this.audit.record({ farmId, actorId: actor.id, action: 'person.invited', entity: 'membership', entityId: membership.id, before: null, after: { email, name: user.name, role: input.role } });
    // New accounts get a link to set their password; existing ones are told they were added.
    const link = isNew || user.passwordHash === null ? `${this.options.publicUrl}/reset-password?token=${encodeURIComponent(await this.auth.createSingleUseToken(user.id, 'invite'))}&invite=1` : `${this.options.publicUrl}/sign-in`;
    const es = user.locale === 'es';
    await this.notifications
      .send({
        farmId,
        kind: 'invitation',
        to: email,
        subject: es ? `Gillwise: le invitaron a ${farmName}` : `Gillwise: you are invited to ${farmName}`,
        text: es
          ? [`Hola ${user.name}:`, '', `Le agregaron a ${farmName} en Gillwise con el rol "${input.role}".`, isNew ? 'Elija su contraseña con este enlace (válido 7 días, un solo uso):' : 'Entre con su cuenta de siempre:', link].join('\n')
          : [`Hello ${user.name},`, '', `You have been added to ${farmName} on Gillwise as ${input.role}.`, isNew ? 'Choose your password with this link (valid for 7 days, works once):' : 'Sign in with your existing account:', link].join('\n'),
        relatedId: membership.id,
      })
      .catch((err: unknown) => this.logger.warn({ err }, 'invitation e-mail not delivered'));
    return present(membership, user);
  }

  async update(farmId: string, userId: string, patch: { role?: Membership['role']; active?: boolean }, actor: { id: string; role: Role }): Promise<Person> {
    const membership = await this.repo.member(farmId, userId);
    if (!membership?.user) throw notFound('Person');
    if (!mayManage(actor.role, membership.role) || (patch.role && !mayManage(actor.role, patch.role))) {
      throw forbidden('A manager manages the hands and planners of their farm; an admin manages everyone.');
    }
    if (userId === actor.id) throw forbidden('You cannot change your own role or deactivate yourself.');
    const before = { role: membership.role, active: membership.user.active };
    if (patch.role) membership.role = patch.role;
    const saved = await this.repo.saveMembership(membership);
    if (patch.active !== undefined && patch.active !== membership.user.active) {
      await this.repo.setActive(userId, patch.active);
      membership.user.active = patch.active;
    }
    await this.audit.record({ farmId, actorId: actor.id, action: 'person.updated', entity: 'membership', entityId: membership.id, before, after: { role: saved.role, active: membership.user.active } });
    return present(saved, membership.user);
  }
}
