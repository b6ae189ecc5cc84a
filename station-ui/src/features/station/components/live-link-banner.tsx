import type { LiveLinkState } from '@/lib/socket';
import classes from './station-screen.module.css';

/** Says so when live values cannot arrive: the screen would otherwise look frozen. */
export function LiveLinkBanner({ link }: { link: LiveLinkState }) {
  if (link === 'live' || link === 'connecting') return null;
  return (
    <div className={classes.linkBanner} role="status" data-testid="live-link-banner">
      {link === 'lost'
        ? 'Live link lost — reconnecting. Values and verdicts appear again once it is back.'
        : 'Live link refused: sign in again to see values and verdicts.'}
    </div>
  );
}
