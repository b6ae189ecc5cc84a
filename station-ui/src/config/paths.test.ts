import { describe, expect, it } from 'vitest';
import { homePathFor } from '@/lib/auth';
import { pageForPathname, paths, safeNextPath } from './paths';

describe('paths', () => {
  it('accepts only addresses inside the app as a return target', () => {
    expect(safeNextPath('/runs?serial=K5A-2648-00017')).toBe('/runs?serial=K5A-2648-00017');
    expect(safeNextPath('https://elsewhere.example/')).toBeNull();
    expect(safeNextPath('//elsewhere.example/')).toBeNull();
    expect(safeNextPath('/\\elsewhere.example')).toBeNull();
    expect(safeNextPath('/sign-in?next=/x')).toBeNull();
    expect(safeNextPath(null)).toBeNull();
  });

  it('builds the sign-in address with the return target encoded', () => {
    expect(paths.signIn.href('/lots?x=1')).toBe('/sign-in?next=%2Flots%3Fx%3D1');
    expect(paths.signIn.href('/')).toBe('/sign-in');
  });

  it('finds the page of nested addresses', () => {
    expect(pageForPathname('/lots/LB-2648-03')?.label).toBe('Lots');
    expect(pageForPathname('/audit')?.label).toBe('Audit trail');
    expect(pageForPathname('/nowhere')).toBeUndefined();
  });

  it('sends each role to its start page (task brief)', () => {
    expect(homePathFor({ roles: ['operator'] })).toBe('/station');
    expect(homePathFor({ roles: ['engineer'] })).toBe('/plans');
    expect(homePathFor({ roles: ['quality'] })).toBe('/quality');
    expect(homePathFor({ roles: ['admin'] })).toBe('/admin/users');
    expect(homePathFor({ roles: ['admin', 'operator'] })).toBe('/station');
  });
});
