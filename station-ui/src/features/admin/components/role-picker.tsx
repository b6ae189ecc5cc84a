import { Checkbox, SimpleGrid } from '@mantine/core';
import type { ReactNode } from 'react';
import { ROLES, roleLabels, type Role } from '@/config/roles';

/** What each role opens, so an admin picks knowingly. */
const roleHints: Record<Role, string> = {
  operator: 'Tests units at a station',
  engineer: 'Plans, fixtures, lots and runs',
  quality: 'Yield, capability, lots and runs',
  admin: 'Users and audit log, plus every screen',
};

interface RolePickerProps {
  value: Role[];
  onChange: (roles: Role[]) => void;
  error?: ReactNode;
}

export function RolePicker({ value, onChange, error }: RolePickerProps) {
  return (
    <Checkbox.Group
      label="Roles"
      description="Someone with several roles sees the screens of each."
      value={value}
      onChange={(v) => onChange(ROLES.filter((r) => v.includes(r)))}
      error={error}
      withAsterisk
    >
      <SimpleGrid cols={{ base: 1, xs: 2 }} mt="xs" spacing="xs">
        {ROLES.map((r) => (
          <Checkbox key={r} value={r} label={roleLabels[r]} description={roleHints[r]} />
        ))}
      </SimpleGrid>
    </Checkbox.Group>
  );
}
