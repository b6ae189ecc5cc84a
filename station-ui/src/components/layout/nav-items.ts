import {
  IconBarcode,
  IconChartDots,
  IconHandStop,
  IconChartHistogram,
  IconClipboardList,
  IconFileSearch,
  IconHistory,
  IconLayoutDashboard,
  IconPackages,
  IconPlugConnected,
  IconTool,
  IconUsers,
  type Icon,
} from '@tabler/icons-react';
import { navGroupLabels, pages, type NavGroup, type PageDef, type PageKey } from '@/config/paths';
import type { Role } from '@/config/roles';

const icons: Record<PageKey, Icon> = {
  station: IconBarcode,
  board: IconLayoutDashboard,
  repair: IconTool,
  plans: IconClipboardList,
  characterization: IconChartDots,
  fixtures: IconPlugConnected,
  lots: IconPackages,
  runs: IconHistory,
  quality: IconChartHistogram,
  holds: IconHandStop,
  adminUsers: IconUsers,
  audit: IconFileSearch,
};

export interface NavItem {
  key: PageKey;
  page: PageDef;
  icon: Icon;
}

export interface NavSection {
  group: NavGroup;
  label: string;
  items: NavItem[];
}

/**
 * The links a person with `roles` sees: every page one of their roles may open, in the fixed order of
 * `pages`, grouped. Several roles give the union.
 */
export function navSectionsFor(roles: readonly Role[]): NavSection[] {
  const sections: NavSection[] = [];
  for (const [key, page] of Object.entries(pages) as [PageKey, PageDef][]) {
    if (!page.roles.some((r) => roles.includes(r))) continue;
    let section = sections.find((s) => s.group === page.group);
    if (!section) {
      section = { group: page.group, label: navGroupLabels[page.group], items: [] };
      sections.push(section);
    }
    section.items.push({ key, page, icon: icons[key] });
  }
  return sections;
}
