import { Badge } from '@mantine/core';
import { VerdictBadge, type VerdictBadgeSize } from '@/components/verdict';
import { isVerdict } from '@/theme';

/**
 * A run's verdict with the shared badge. `running` has no verdict look (the unit is not judged yet), so it
 * is written out plainly instead of borrowing one.
 */
export function RunVerdict({ verdict, size = 'sm' }: { verdict: string; size?: VerdictBadgeSize }) {
  if (isVerdict(verdict)) return <VerdictBadge verdict={verdict} size={size} />;
  return (
    <Badge variant="outline" color="graphite" radius="sm" data-verdict={verdict}>
      {verdict === 'running' ? 'Testing…' : verdict}
    </Badge>
  );
}
