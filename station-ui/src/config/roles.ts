import type { ApiRole } from '@/lib/api-schema';

/** The roles the station server knows: the type comes from its OpenAPI document (UserDto.roles). */
export type Role = ApiRole;

/** Every role, in the order pickers list them. */
export const ROLES = ['operator', 'engineer', 'quality', 'admin'] as const satisfies readonly Role[];

// Compile-time drift check: a role the server adds and this list lacks fails the type-check here.
const everyRoleListed: Exclude<Role, (typeof ROLES)[number]> extends never ? true : never = true;
void everyRoleListed;

/** How each role is named on screen. */
export const roleLabels: Record<Role, string> = {
  operator: 'Operator',
  engineer: 'Engineer',
  quality: 'Quality',
  admin: 'Admin',
};

/** Joins role names for a sentence: "Engineer, Quality or Admin". */
export function describeRoles(roles: readonly Role[]): string {
  const names = roles.map((r) => roleLabels[r]);
  if (names.length <= 1) return names.join('');
  return `${names.slice(0, -1).join(', ')} or ${names[names.length - 1]}`;
}
