/** Which bench the app is driving: none, the simulated one, or real instruments; and any instrument whose link is lost. */
import { useStore } from '../state/use-store.ts';
import { useApp } from './app-context.ts';
import { lostLinksText } from './status-text.ts';

export function ConnectionBadge() {
  const { stores } = useApp();
  const connected = useStore(stores.connection, (s) => s.connection.connected);
  const simulated = useStore(stores.connection, (s) => s.connection.simulated);
  // A string, not an array: the selector must return a stable value.
  const lostJoined = useStore(stores.connection, (s) =>
    connected && s.status
      ? s.status.links
          .filter((link) => link.state === 'lost')
          .map((link) => link.role)
          .join(' ')
      : '',
  );
  const lostRoles = lostJoined === '' ? [] : lostJoined.split(' ');
  const lost = lostLinksText(lostRoles);
  const kind = !connected ? 'none' : simulated ? 'sim' : 'real';
  const text =
    kind === 'none'
      ? 'No bench connected'
      : kind === 'sim'
        ? 'SIMULATED BENCH — no instruments'
        : 'Instruments connected';
  return (
    <span
      className={`badge badge-${kind}${lost ? ' badge-lost' : ''}`}
      data-testid="connection-badge"
      data-kind={kind}
      data-lost={lost ? lostJoined : undefined}
      role="status"
    >
      {lost ? `${text} · ${lost}` : text}
    </span>
  );
}
