import { EntityManager } from '@mikro-orm/sqlite';
import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { hash } from 'bcryptjs';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import type { CreateUserDto, ResetPasswordDto, UpdateUserDto, UserDto } from './dto/user.dto';
import { UserAccessEvents } from './user-access.events';
import { User } from './user.entity';

/** bcrypt cost factor: 2^10 rounds, the bcryptjs default (about 70 ms per hash on the station PC). */
export const BCRYPT_COST = 10;

/** Hashes a password for storage. */
export function hashPassword(password: string): Promise<string> {
  return hash(password, BCRYPT_COST);
}

export function toUserDto(u: User): UserDto {
  return { id: u.id, username: u.username, displayName: u.displayName, roles: [...u.roles], active: u.active };
}

/** The audit view of a user: everything in the DTO (never the hash). */
function snapshot(u: User): Record<string, unknown> {
  return { ...toUserDto(u) };
}

/** True when the user counts towards "at least one active admin must remain". */
export function isActiveAdmin(u: Pick<User, 'active' | 'roles'>): boolean {
  return u.active && u.roles.includes('admin');
}

@Injectable()
export class UsersService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
    private readonly access: UserAccessEvents,
  ) {}

  async list(): Promise<UserDto[]> {
    const users = await this.em.find(User, {}, { orderBy: { username: 'asc' } });
    return users.map(toUserDto);
  }

  async create(dto: CreateUserDto, actor: AuthUser): Promise<UserDto> {
    await this.assertUsernameFree(dto.username);
    const passwordHash = await hashPassword(dto.password);
    // one transaction: the audit needs the new id, so the user is flushed first, then the event
    return this.em.transactional(async (em) => {
      const user = em.create(User, {
        username: dto.username,
        displayName: dto.displayName.trim(),
        passwordHash,
        roles: dto.roles,
        active: true,
      }, { partial: true });
      await em.flush();
      await this.audit.record({ actor: actor.id, action: 'user.created', entityType: 'user', entityId: user.id, after: snapshot(user) }, em);
      return toUserDto(user);
    });
  }

  async update(id: number, dto: UpdateUserDto, actor: AuthUser): Promise<UserDto> {
    const user = await this.get(id);
    const before = snapshot(user);
    const next = { active: dto.active ?? user.active, roles: dto.roles ?? user.roles };
    if (isActiveAdmin(user) && !isActiveAdmin(next)) await this.assertAnotherActiveAdmin(user);
    if (dto.displayName !== undefined) user.displayName = dto.displayName.trim();
    user.roles = [...next.roles];
    user.active = next.active;
    const after = snapshot(user);
    // a PATCH that sets what is already there is not worth an audit line
    if (JSON.stringify(before) !== JSON.stringify(after)) {
      await this.audit.record({ actor: actor.id, action: actionFor(before, after), entityType: 'user', entityId: user.id, before, after }, this.em);
    }
    await this.em.flush();
    // open sockets re-check their rights now (deactivation and role loss end them)
    if (before.active !== after.active || JSON.stringify(before.roles) !== JSON.stringify(after.roles)) this.access.changed(user.id);
    return toUserDto(user);
  }

  async resetPassword(id: number, dto: ResetPasswordDto, actor: AuthUser): Promise<void> {
    const user = await this.get(id);
    user.passwordHash = await hashPassword(dto.password);
    await this.audit.record({ actor: actor.id, action: 'user.password_reset', entityType: 'user', entityId: user.id }, this.em);
    await this.em.flush();
  }

  private async get(id: number): Promise<User> {
    const user = await this.em.findOne(User, { id });
    if (!user) throw new NotFoundException({ message: `There is no user with id ${id}.`, details: { code: 'unknown_user' } });
    return user;
  }

  private async assertUsernameFree(username: string): Promise<void> {
    if (await this.em.count(User, { username })) {
      throw new ConflictException({
        message: `The username "${username}" is already taken. Choose another one, or reactivate the existing account.`,
        details: { code: 'username_taken' },
      });
    }
  }

  private async assertAnotherActiveAdmin(user: User): Promise<void> {
    const others = await this.em.find(User, { id: { $ne: user.id }, active: true });
    if (!others.some(isActiveAdmin)) {
      throw new ConflictException({
        message: `"${user.username}" is the last active administrator. Give another active user the admin role first, so someone can still manage users.`,
        details: { code: 'last_admin' },
      });
    }
  }
}

function actionFor(before: Record<string, unknown>, after: Record<string, unknown>): string {
  if (before.active === true && after.active === false) return 'user.deactivated';
  if (before.active === false && after.active === true) return 'user.reactivated';
  return 'user.updated';
}
