import { Button, Group, Paper, Text, ThemeIcon, Title } from '@mantine/core';
import { IconLock } from '@tabler/icons-react';
import { Link, useLocation } from 'react-router-dom';
import { pageForPathname } from '@/config/paths';
import { describeRoles, roleLabels, type Role } from '@/config/roles';
import { homePathFor, useUser } from '@/lib/auth';

interface NotAllowedProps {
  /** Roles that may open this page; taken from the address when not given */
  allowedRoles?: readonly Role[];
  /** What the server said, when the refusal came from an API call */
  serverMessage?: string;
}

/**
 * Shown instead of a page the signed-in person's roles do not open, and for any 403 from the server.
 * Says who may open it so the person knows whom to ask.
 */
export function NotAllowed({ allowedRoles, serverMessage }: NotAllowedProps) {
  const { pathname } = useLocation();
  const { data: user } = useUser();
  const target = pageForPathname(pathname);
  const roles = allowedRoles ?? target?.roles;
  const mine = user?.roles ?? [];

  return (
    <Paper withBorder p="xl" radius="md" maw={680} role="alert" aria-labelledby="not-allowed-title">
      <Group gap="md" align="flex-start" wrap="nowrap">
        <ThemeIcon size={52} radius="md" color="signalRed" variant="light">
          <IconLock size={30} aria-hidden />
        </ThemeIcon>
        <div>
          <Title order={1} fz={26} id="not-allowed-title">
            Not allowed for your role
          </Title>
          <Text size="lg" mt="xs">
            {roles && roles.length > 0 ? (
              <>
                {target ? `“${target.label}”` : 'This page'} can be opened by{' '}
                <strong data-testid="allowed-roles">{describeRoles(roles)}</strong>.
              </>
            ) : (
              'Your roles do not include this action.'
            )}
          </Text>
          <Text c="dimmed" mt={4}>
            {mine.length > 0
              ? `You are signed in as ${mine.map((r) => roleLabels[r]).join(', ')}. Ask an administrator if you need access.`
              : 'Your account has no roles yet. Ask an administrator to give you one.'}
          </Text>
          {serverMessage && (
            <Text c="dimmed" size="sm" mt="xs">
              The station server said: {serverMessage}
            </Text>
          )}
          {user && (
            <Button component={Link} to={homePathFor(user)} mt="lg" size="md" variant="filled">
              Go to my start page
            </Button>
          )}
        </div>
      </Group>
    </Paper>
  );
}
