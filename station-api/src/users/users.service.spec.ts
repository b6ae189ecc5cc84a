import { compare } from 'bcryptjs';
import { describe, expect, it } from 'vitest';
import { BCRYPT_COST, hashPassword, isActiveAdmin, toUserDto } from './users.service';
import { User } from './user.entity';

describe('users', () => {
  it('counts only active users holding the admin role towards the last-admin rule', () => {
    expect(isActiveAdmin({ active: true, roles: ['engineer', 'admin'] })).toBe(true);
    expect(isActiveAdmin({ active: false, roles: ['admin'] })).toBe(false);
    expect(isActiveAdmin({ active: true, roles: ['quality'] })).toBe(false);
  });

  it('hashes with bcrypt cost 10 and verifies', async () => {
    const h = await hashPassword('operator-demo');
    // modular crypt format of bcrypt: $2<variant>$<cost>$<22-char salt><31-char hash> (OpenBSD bcrypt(3))
    expect(h).toMatch(new RegExp(`^\\$2[aby]\\$${BCRYPT_COST}\\$[./A-Za-z0-9]{53}$`));
    expect(await compare('operator-demo', h)).toBe(true);
    expect(await compare('operator-dem0', h)).toBe(false);
  });

  it('maps a user without its password hash', () => {
    const u = Object.assign(new User(), { id: 7, username: 'op', displayName: 'Op', roles: ['operator'], active: true, passwordHash: '$2b$10$x' });
    const dto = toUserDto(u);
    expect(dto).toEqual({ id: 7, username: 'op', displayName: 'Op', roles: ['operator'], active: true });
    expect(JSON.stringify(dto)).not.toContain('$2b$');
  });
});
