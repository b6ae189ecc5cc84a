/** The four roles the station server knows (station-api/src/users/user.entity.ts). */
export const ROLES = ['operator', 'engineer', 'quality', 'admin'] as const;
export type Role = (typeof ROLES)[number];

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
