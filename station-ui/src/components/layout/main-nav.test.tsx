import { screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { Role } from '@/config/roles';
import { makeUser, renderApp } from '@/testing/render';
import { MainNav } from './main-nav';

function linkNames(): string[] {
  const nav = screen.getByRole('navigation', { name: 'Main' });
  return within(nav)
    .queryAllByRole('link')
    .map((a) => a.textContent ?? '');
}

// Expected sets come from the task brief (role → navigation); order is the fixed order of config/paths.ts.
const cases: [Role[], string[]][] = [
  [['operator'], ['Station', 'Board']],
  [['engineer'], ['Station', 'Board', 'Repair', 'Plans', 'Limits from data', 'Fixtures', 'Lots', 'Runs', 'Quality', 'Holds and alerts', 'Audit trail']],
  [['quality'], ['Board', 'Repair', 'Lots', 'Runs', 'Quality', 'Holds and alerts', 'Audit trail']],
  [['admin'], ['Station', 'Board', 'Repair', 'Plans', 'Limits from data', 'Fixtures', 'Lots', 'Runs', 'Quality', 'Holds and alerts', 'Audit trail', 'Users']],
  [['operator', 'quality'], ['Station', 'Board', 'Repair', 'Lots', 'Runs', 'Quality', 'Holds and alerts', 'Audit trail']],
  [['engineer', 'quality'], ['Station', 'Board', 'Repair', 'Plans', 'Limits from data', 'Fixtures', 'Lots', 'Runs', 'Quality', 'Holds and alerts', 'Audit trail']],
  [[], []],
];

describe('MainNav', () => {
  it.each(cases)('roles %j see exactly %j', (roles, expected) => {
    renderApp(<MainNav roles={roles} />, { signedInAs: makeUser(roles) });
    expect(linkNames()).toEqual(expected);
  });

  it('points each link at its page and marks the current one', () => {
    renderApp(<MainNav roles={['engineer']} />, { route: '/lots/LB-2648-03', signedInAs: makeUser(['engineer']) });
    const lots = screen.getByRole('link', { name: 'Lots' });
    expect(lots).toHaveAttribute('href', '/lots');
    expect(lots).toHaveAttribute('data-active');
    expect(screen.getByRole('link', { name: 'Plans' })).not.toHaveAttribute('data-active');
  });
});
