import { createContext, useContext, useEffect, useMemo, useSyncExternalStore } from 'react';
import type { Topic } from '../../shared/schemas/ws';
import { getLiveSocket, type LiveSocket, type SocketState } from './live-socket';
import { LiveStore, type LiveView } from './live-store';

/** Lets tests hand in a fake socket; the app uses the shared one. */
export const LiveSocketContext = createContext<(Pick<LiveSocket, 'subscribe' | 'onState' | 'state'> & { clockOffsetMs?: number }) | null>(null);

function useSocket() {
  return useContext(LiveSocketContext) ?? getLiveSocket();
}

/** A LiveStore fed by one topic for as long as the component is mounted. */
export function useLiveStore(topic: Topic | null): LiveStore {
  const socket = useSocket();
  const kind = topic?.kind;
  const id = topic?.id;
  // A new topic gets a fresh store: one run's readings never mix with another's.
  const store = useMemo(() => new LiveStore(), [kind, id]); // eslint-disable-line react-hooks/exhaustive-deps
  useEffect(() => {
    if (!kind || !id) return;
    return socket.subscribe({ kind, id }, (message) => store.handle(message));
  }, [socket, store, kind, id]);
  return store;
}

/** Re-renders at most once per animation frame with the store's latest picture. */
export function useLiveView(store: LiveStore): LiveView {
  return useSyncExternalStore(store.subscribe, store.getSnapshot);
}

/** The live connection's state, for a small "live / reconnecting" badge. */
export function useSocketState(): SocketState {
  const socket = useSocket();
  return useSyncExternalStore(
    (l) => socket.onState(() => l()),
    () => socket.state,
  );
}

/** Server clock minus browser clock (ms), so "last reading 3 s ago" is right on a skewed PC. */
export function useServerClockOffsetMs(): number {
  return useSocket().clockOffsetMs ?? 0;
}
