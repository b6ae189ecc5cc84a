import { ExecutionContext, ForbiddenException } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { describe, expect, it } from 'vitest';
import { Public } from '../decorators/public.decorator';
import { Roles } from '../decorators/roles.decorator';
import { describeTokenProblem } from './jwt-auth.guard';
import { checkRoles, RolesGuard } from './roles.guard';

class Probe {
  @Roles('engineer', 'admin') engineering() {}
  @Public() open() {}
  forgotten() {}
}

@Roles('quality')
class QualityOnly {
  list() {}
  @Roles('admin') adminOverride() {}
}

function ctx(cls: new () => object, method: string, roles?: string[], type = 'http'): ExecutionContext {
  return {
    getType: () => type,
    getHandler: () => (cls.prototype as Record<string, unknown>)[method],
    getClass: () => cls,
    switchToHttp: () => ({ getRequest: () => ({ user: roles ? { id: 1, username: 'u', displayName: 'U', roles } : undefined }) }),
  } as unknown as ExecutionContext;
}

describe('checkRoles', () => {
  it('passes when the user holds any one of the required roles', () => {
    expect(() => checkRoles(['engineer', 'admin'], { roles: ['operator', 'admin'] })).not.toThrow();
  });

  it('refuses with 403 naming the required roles when none is held', () => {
    expect(() => checkRoles(['admin'], { roles: ['operator'] })).toThrow(ForbiddenException);
    expect(() => checkRoles(['admin'], { roles: ['operator'] })).toThrow(/one of the roles admin/);
    expect(() => checkRoles(['admin'], undefined)).toThrow(ForbiddenException);
  });

  it('fails closed when a route declares no role, even for an admin', () => {
    expect(() => checkRoles(undefined, { roles: ['admin'] })).toThrow(/route declares no role/);
    expect(() => checkRoles([], { roles: ['admin'] })).toThrow(/route declares no role/);
  });
});

describe('RolesGuard', () => {
  const guard = new RolesGuard(new Reflector());

  it('reads @Roles from the handler, falling back to the class', () => {
    expect(guard.canActivate(ctx(Probe, 'engineering', ['engineer']))).toBe(true);
    expect(() => guard.canActivate(ctx(Probe, 'engineering', ['operator']))).toThrow(ForbiddenException);
    expect(guard.canActivate(ctx(QualityOnly, 'list', ['quality']))).toBe(true);
    // the handler's declaration overrides the class's
    expect(() => guard.canActivate(ctx(QualityOnly, 'adminOverride', ['quality']))).toThrow(ForbiddenException);
  });

  it('lets @Public routes through and refuses undeclared ones', () => {
    expect(guard.canActivate(ctx(Probe, 'open'))).toBe(true);
    expect(() => guard.canActivate(ctx(Probe, 'forgotten', ['admin']))).toThrow(/route declares no role/);
  });

  it('leaves socket traffic to the gateway, which checks the token at the handshake', () => {
    expect(guard.canActivate(ctx(Probe, 'forgotten', undefined, 'ws'))).toBe(true);
  });
});

describe('describeTokenProblem', () => {
  it('tells an expired token, a missing one and a bad one apart', () => {
    // error names and texts as jsonwebtoken and passport-jwt raise them
    expect(describeTokenProblem({ name: 'TokenExpiredError', message: 'jwt expired' })).toMatch(/expired/);
    expect(describeTokenProblem(new Error('No auth token'))).toMatch(/no access token/);
    expect(describeTokenProblem({ name: 'JsonWebTokenError', message: 'invalid signature' })).toMatch(/not valid/);
  });
});
