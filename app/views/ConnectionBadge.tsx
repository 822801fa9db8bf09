/** Which bench the app is driving: none, the simulated one, or real instruments. */
import { useStore } from '../state/use-store.ts';
import { useApp } from './app-context.ts';

export function ConnectionBadge() {
  const { stores } = useApp();
  const connected = useStore(stores.connection, (s) => s.connection.connected);
  const simulated = useStore(stores.connection, (s) => s.connection.simulated);
  const kind = !connected ? 'none' : simulated ? 'sim' : 'real';
  const text =
    kind === 'none'
      ? 'No bench connected'
      : kind === 'sim'
        ? 'SIMULATED BENCH — no instruments'
        : 'Instruments connected';
  return (
    <span className={`badge badge-${kind}`} data-testid="connection-badge" data-kind={kind} role="status">
      {text}
    </span>
  );
}
