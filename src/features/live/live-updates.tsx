import { createContext, useContext, useEffect, useState, useSyncExternalStore, type ReactNode } from 'react';
import { useQueryClient, type QueryClient, type QueryKey } from '@tanstack/react-query';
import type { ChangeEvent, HelloEvent, PresenceEvent, Viewer } from '@shared/schemas/events';
import { api } from '@/lib/api-client';

/** The query keys a change makes stale: the app composes it from each feature's key factory. */
export type StaleKeysOf = (change: ChangeEvent) => QueryKey[];

/** Who has which plan open, as the stream last said, with subscribers for React. */
class PresenceStore {
  private byPlan = new Map<number, Viewer[]>();
  private listeners = new Set<() => void>();
  set(p: PresenceEvent) {
    this.byPlan.set(p.planId, p.viewers);
    for (const l of this.listeners) l();
  }
  get = (planId: number): Viewer[] | undefined => this.byPlan.get(planId);
  subscribe = (l: () => void) => {
    this.listeners.add(l);
    return () => this.listeners.delete(l);
  };
}

/**
 * The app's one live stream: it tells the server which plan this screen shows (presence) and keeps
 * the presence it is told.
 */
class LiveClient {
  readonly presence = new PresenceStore();
  private connection: string | null = null;
  private planId: number | null = null;

  /** Opens the stream; answers the function that closes it. */
  connect(queryClient: QueryClient, staleKeysOf: StaleKeysOf): () => void {
    if (typeof EventSource === 'undefined') return () => {};
    const source = new EventSource('/api/events');
    source.addEventListener('hello', (e) => {
      this.connection = (JSON.parse(e.data) as HelloEvent).connection;
      if (this.planId !== null) this.tellPresence();
    });
    source.addEventListener('change', (e) => {
      const change = JSON.parse(e.data) as ChangeEvent;
      // a deletion only marks what it touches stale: refetching a record that is gone would 404
      const refetchType = change.deleted ? 'none' : 'active';
      for (const queryKey of staleKeysOf(change))
        void queryClient.invalidateQueries({ queryKey, refetchType });
    });
    source.addEventListener('reset', () => void queryClient.invalidateQueries());
    source.addEventListener('presence', (e) => this.presence.set(JSON.parse(e.data) as PresenceEvent));
    return () => {
      source.close();
      this.connection = null;
    };
  }

  /** the plan this screen shows; null when it shows none */
  watch(planId: number | null) {
    if (this.planId === planId) return;
    this.planId = planId;
    this.tellPresence();
  }

  private tellPresence() {
    const { connection, planId } = this;
    if (!connection) return;
    void api
      .post<{ presence: PresenceEvent | null }>('/events/presence', { connection, planId })
      .then((r) => r.presence && this.presence.set(r.presence))
      .catch(() => {
        // the stream reconnects and says hello again; presence is told then
      });
  }
}

const LiveContext = createContext<LiveClient | null>(null);

/**
 * One live stream for the signed-in app (`GET /api/events`): each change marks the cached queries
 * it touches stale, so what is on screen refetches (no polling); `reset` (the stream missed too much)
 * refetches everything. The browser reconnects by itself and sends `Last-Event-ID`.
 */
export function LiveUpdates({ staleKeysOf, children }: { staleKeysOf: StaleKeysOf; children: ReactNode }) {
  const queryClient = useQueryClient();
  const [live] = useState(() => new LiveClient());
  useEffect(() => live.connect(queryClient, staleKeysOf), [live, queryClient, staleKeysOf]);
  return <LiveContext.Provider value={live}>{children}</LiveContext.Provider>;
}

const NO_ONE: Viewer[] = [];

/** Says this screen shows `planId` while it is mounted, and answers who has it open. */
export function usePlanPresence(planId: number | null): Viewer[] {
  const live = useContext(LiveContext);
  useEffect(() => {
    if (!live || planId === null) return;
    live.watch(planId);
    return () => live.watch(null);
  }, [live, planId]);
  return useSyncExternalStore(
    live?.presence.subscribe ?? (() => () => {}),
    () => (planId === null ? undefined : live?.presence.get(planId)) ?? NO_ONE,
  );
}
