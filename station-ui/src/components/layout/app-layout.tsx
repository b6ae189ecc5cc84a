import { ActionIcon, AppShell, Badge, Box, Burger, Button, Group } from '@mantine/core';
import { useDisclosure } from '@mantine/hooks';
import { IconLogout } from '@tabler/icons-react';
import type { ReactNode } from 'react';
import { Link, useLocation } from 'react-router-dom';
import { pages, paths } from '@/config/paths';
import { roleLabels } from '@/config/roles';
import type { AuthUser } from '@/lib/auth';
import classes from './app-layout.module.css';
import { BrandMark } from './brand-mark';
import { MainNav } from './main-nav';
import { SerialSearch } from './serial-search';

interface AppLayoutProps {
  user: AuthUser;
  onSignOut: () => void;
  children: ReactNode;
}

/** The frame around every signed-in page: product name, who is signed in, navigation by role. */
export function AppLayout({ user, onSignOut, children }: AppLayoutProps) {
  const location = useLocation();
  const [navOpen, { toggle, close }] = useDisclosure(false);
  // the station has its own scan field for testing: a second serial box there would catch the operator's scans
  const atStation = location.pathname.startsWith(pages.station.path);
  return (
    <AppShell
      header={{ height: 64 }}
      navbar={{ width: 232, breakpoint: 'sm', collapsed: { mobile: !navOpen } }}
      padding="lg"
    >
      <AppShell.Header className={classes.header}>
        <div className={classes.headerInner}>
        <Group gap="sm" wrap="nowrap">
          <Burger
            opened={navOpen}
            onClick={toggle}
            hiddenFrom="sm"
            size="sm"
            color="var(--mantine-color-graphite-0)"
            aria-label={navOpen ? 'Close navigation' : 'Open navigation'}
          />
          <Link to={paths.home.href()} className={classes.brand} aria-label="Railwright, start page">
            <BrandMark size={30} />
            <span className={classes.brandName}>Railwright</span>
          </Link>
        </Group>
        {!atStation && <SerialSearch />}
        <div className={classes.user} aria-label="Signed in">
          <Box visibleFrom="sm" style={{ minWidth: 0, textAlign: 'right' }}>
            <div className={classes.userName} data-testid="signed-in-name">
              {user.displayName}
            </div>
            <div className={classes.userLogin}>{user.username}</div>
          </Box>
          <Group gap={4} wrap="nowrap" visibleFrom="md" aria-label="Your roles">
            {user.roles.map((r) => (
              <Badge key={r} variant="outline" color="copper.3" radius="sm" size="md">
                {roleLabels[r]}
              </Badge>
            ))}
          </Group>
          <Button
            variant="default"
            size="sm"
            leftSection={<IconLogout size={18} aria-hidden />}
            onClick={onSignOut}
            visibleFrom="xs"
          >
            Sign out
          </Button>
          <ActionIcon variant="default" size="lg" onClick={onSignOut} hiddenFrom="xs" aria-label="Sign out" title="Sign out">
            <IconLogout size={20} aria-hidden />
          </ActionIcon>
        </div>
        </div>
      </AppShell.Header>
      <AppShell.Navbar p="sm" className={classes.navbar}>
        <AppShell.Section grow>
          <MainNav roles={user.roles} onNavigate={close} />
        </AppShell.Section>
        {/* On narrow screens the header has no room for the name; say it here instead. */}
        <AppShell.Section hiddenFrom="sm" pt="sm" className={classes.navUser}>
          <div className={classes.userNameDark}>{user.displayName}</div>
          <Group gap={4} mt={4}>
            {user.roles.map((r) => (
              <Badge key={r} variant="light" color="copper" radius="sm">
                {roleLabels[r]}
              </Badge>
            ))}
          </Group>
        </AppShell.Section>
      </AppShell.Navbar>
      <AppShell.Main className={classes.main}>{children}</AppShell.Main>
    </AppShell>
  );
}
