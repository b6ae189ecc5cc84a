import { NavLink, Stack, Text } from '@mantine/core';
import { NavLink as RouterLink, useLocation } from 'react-router-dom';
import { matchPath } from 'react-router-dom';
import type { Role } from '@/config/roles';
import classes from './app-layout.module.css';
import { navSectionsFor } from './nav-items';

interface MainNavProps {
  roles: readonly Role[];
  /** Called after a link is followed (closes the drawer on narrow screens) */
  onNavigate?: () => void;
}

/** Navigation links for the signed-in person's roles, grouped by area of work. */
export function MainNav({ roles, onNavigate }: MainNavProps) {
  const { pathname } = useLocation();
  const sections = navSectionsFor(roles);
  return (
    <nav aria-label="Main">
      <Stack gap="lg">
        {sections.length === 0 && (
          <Text c="dimmed" size="sm" px="sm">
            Your account has no roles, so there is nothing to open yet. Ask an administrator.
          </Text>
        )}
        {sections.map((section) => (
          <div key={section.group}>
            <Text component="h2" className={classes.navHeading} id={`nav-${section.group}`}>
              {section.label}
            </Text>
            <ul className={classes.navList} aria-labelledby={`nav-${section.group}`}>
              {section.items.map(({ key, page, icon: ItemIcon }) => (
                <li key={key}>
                  <NavLink
                    component={RouterLink}
                    to={page.href()}
                    label={page.label}
                    leftSection={<ItemIcon size={20} stroke={1.8} aria-hidden />}
                    active={matchPath({ path: page.path, end: false }, pathname) !== null}
                    onClick={onNavigate}
                    className={classes.navLink}
                  />
                </li>
              ))}
            </ul>
          </div>
        ))}
      </Stack>
    </nav>
  );
}
