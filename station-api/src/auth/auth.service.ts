import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable, UnauthorizedException } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { compare } from 'bcryptjs';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { describeTokenProblem } from '../common/guards/jwt-auth.guard';
import type { UserDto } from '../users/dto/user.dto';
import { toUserDto } from '../users/users.service';
import { Role, User } from '../users/user.entity';
import type { LoginDto, LoginResponseDto } from './dto/login.dto';

/** What the access token carries. Roles are informative; the server re-reads them on every request. */
export interface TokenPayload {
  sub: number;
  username: string;
  roles: Role[];
}

/** What a board display token carries: no user, only the board scope and the label it was issued for. */
export interface BoardTokenPayload {
  scope: 'board';
  label: string;
  /** id of the admin who issued it (for the record; deactivating them does not revoke the token) */
  issuedBy: number;
}

/** Board display links last 30 days; changing JWT_SECRET revokes them all. */
export const BOARD_TOKEN_LIFETIME_S = 30 * 86_400;

/** The principal a board display token stands for. */
export function boardPrincipal(label: string): AuthUser {
  return { id: 0, username: 'board-display', displayName: label, roles: [], scope: 'board' };
}

function isBoardPayload(p: unknown): p is BoardTokenPayload {
  return (p as { scope?: unknown } | null)?.scope === 'board';
}

/** Injection token for the token lifetime in seconds (from JWT_EXPIRES_IN). */
export const TOKEN_LIFETIME_S = Symbol('TOKEN_LIFETIME_S');

// Compared against when the username is unknown, so an unknown name takes as long as a wrong password
// and response time does not tell which usernames exist. Hash of a random string, cost 10.
const DUMMY_HASH = '$2b$10$PJipaDDV5gSpd9tXbniiQuZTzUnAEfOqTOC2TvNXtpEk8Mari/MaW';

/** Same words for unknown user and wrong password, so the reply does not confirm a username exists. */
export const BAD_CREDENTIALS = 'Wrong username or password.';

export function toAuthUser(u: User): AuthUser {
  return { id: u.id, username: u.username, displayName: u.displayName, roles: [...u.roles] };
}

@Injectable()
export class AuthService {
  constructor(
    private readonly em: EntityManager,
    private readonly jwt: JwtService,
    private readonly audit: AuditService,
  ) {}

  /** Checks the credentials, audits the attempt either way, and issues a token. */
  async login(dto: LoginDto, lifetimeS: number): Promise<LoginResponseDto> {
    const username = dto.username.trim().toLowerCase();
    const em = this.em.fork();
    const user = await em.findOne(User, { username });
    const passwordOk = await compare(dto.password, user?.passwordHash ?? DUMMY_HASH);
    if (!user || !passwordOk || !user.active) {
      const reason = !user ? 'unknown user' : !user.active ? (passwordOk ? 'deactivated' : 'deactivated (and wrong password)') : 'wrong password';
      await this.audit.record({ actorName: username, action: 'auth.login_failed', entityType: 'user', entityId: user?.id, reason }, em);
      await em.flush();
      // only someone who knows the password learns the account is deactivated
      throw new UnauthorizedException(
        user && passwordOk
          ? { message: 'This account is deactivated. Ask an administrator to reactivate it.', details: { code: 'account_deactivated' } }
          : { message: BAD_CREDENTIALS, details: { code: 'bad_credentials' } },
      );
    }
    await this.audit.record({ actor: user, actorName: user.username, action: 'auth.login', entityType: 'user', entityId: user.id }, em);
    await em.flush();
    const payload: TokenPayload = { sub: user.id, username: user.username, roles: [...user.roles] };
    const accessToken = await this.jwt.signAsync(payload);
    return { accessToken, expiresIn: lifetimeS, user: toUserDto(user) };
  }

  /**
   * Loads the user a token names and checks the account is still active, so deactivation and role
   * changes take effect on the next request rather than when the token expires.
   */
  async loadActiveUser(id: number): Promise<AuthUser> {
    const user = await this.em.fork().findOne(User, { id });
    if (!user || !user.active) {
      throw new UnauthorizedException({
        message: 'This account has been deactivated or removed since you signed in. Ask an administrator.',
        details: { code: 'account_deactivated' },
      });
    }
    return toAuthUser(user);
  }

  /** Issues a board display token (audited). */
  async issueBoardToken(label: string, actor: AuthUser): Promise<{ token: string; expiresAt: string }> {
    const payload: BoardTokenPayload = { scope: 'board', label, issuedBy: actor.id };
    const token = await this.jwt.signAsync(payload, { expiresIn: BOARD_TOKEN_LIFETIME_S });
    const expiresAt = new Date(Date.now() + BOARD_TOKEN_LIFETIME_S * 1000).toISOString();
    await this.audit.record({ actor: actor.id, action: 'auth.board_token_issued', entityType: 'board_display', reason: label, after: { label, expiresAt } });
    return { token, expiresAt };
  }

  /** The principal a verified token names: a board display, or the (active) user re-read from the database. */
  principalOf(payload: TokenPayload | BoardTokenPayload): Promise<AuthUser> {
    if (isBoardPayload(payload)) return Promise.resolve(boardPrincipal(String(payload.label ?? '')));
    if (typeof payload.sub !== 'number') throw new UnauthorizedException(describeTokenProblem(undefined));
    return this.loadActiveUser(payload.sub);
  }

  async me(id: number): Promise<UserDto> {
    const user = await this.em.fork().findOneOrFail(User, { id });
    return toUserDto(user);
  }

  /**
   * Verifies an access token outside an HTTP request (the socket.io handshake): signature, expiry and
   * that the account is still active.
   * @throws UnauthorizedException with a readable message when the token is missing, forged, expired
   *   or names an inactive account
   */
  async verifyAccessToken(token: string | undefined | null): Promise<AuthUser & { expiresAtMs: number }> {
    if (!token) throw new UnauthorizedException(describeTokenProblem({ message: 'No auth token' }));
    let payload: (TokenPayload | BoardTokenPayload) & { exp?: number };
    try {
      payload = await this.jwt.verifyAsync<(TokenPayload | BoardTokenPayload) & { exp?: number }>(token);
    } catch (err) {
      throw new UnauthorizedException(describeTokenProblem(err));
    }
    if (typeof payload.exp !== 'number') throw new UnauthorizedException(describeTokenProblem(undefined));
    return { ...(await this.principalOf(payload)), expiresAtMs: payload.exp * 1000 };
  }
}
