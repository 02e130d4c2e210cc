import { useSyncExternalStore } from 'react';
import type { LaneId } from './playback-model';

export type FollowTarget = LaneId | 'free';

/**
 * The playback clock: a small mutable store read every frame by the 3D overlays and by the DOM
 * readouts through refs. React components subscribe only to coarse values (playing, speed, the
 * current steps) through `useClock`, so a running clock does not re-render the page each frame.
 */
export interface PlaybackClock {
  readonly t: number;
  readonly playing: boolean;
  readonly speed: number;
  readonly follow: FollowTarget;
  readonly endSeconds: number;
  seek(t: number): void;
  play(): void;
  pause(): void;
  toggle(): void;
  setSpeed(speed: number): void;
  setFollow(follow: FollowTarget): void;
  subscribe(listener: () => void): () => void;
  dispose(): void;
}

export interface ClockOptions {
  startAt?: number;
  speed?: number;
  now?: () => number;
  requestFrame?: (cb: () => void) => number;
  cancelFrame?: (id: number) => void;
}

export function createPlaybackClock(endSeconds: number, options: ClockOptions = {}): PlaybackClock {
  const now = options.now ?? (() => performance.now());
  const requestFrame = options.requestFrame ?? ((cb) => requestAnimationFrame(cb));
  const cancelFrame = options.cancelFrame ?? ((id) => cancelAnimationFrame(id));
  const listeners = new Set<() => void>();
  const clamp = (t: number) => Math.min(endSeconds, Math.max(0, t));
  const state = {
    t: clamp(options.startAt ?? 0),
    playing: false,
    speed: options.speed ?? 60,
    follow: 'free' as FollowTarget,
  };
  let frame: number | null = null;
  let last = 0;

  const emit = () => listeners.forEach((l) => l());
  const stop = () => {
    if (frame !== null) cancelFrame(frame);
    frame = null;
  };
  const tick = () => {
    const at = now();
    state.t = clamp(state.t + ((at - last) / 1000) * state.speed);
    last = at;
    if (state.t >= endSeconds) {
      state.playing = false;
      frame = null;
    } else frame = requestFrame(tick);
    emit();
  };

  const play = () => {
    if (state.playing) return;
    if (state.t >= endSeconds) state.t = 0;
    state.playing = true;
    last = now();
    frame = requestFrame(tick);
    emit();
  };
  const pause = () => {
    if (!state.playing) return;
    state.playing = false;
    stop();
    emit();
  };

  return {
    get t() {
      return state.t;
    },
    get playing() {
      return state.playing;
    },
    get speed() {
      return state.speed;
    },
    get follow() {
      return state.follow;
    },
    endSeconds,
    seek(t) {
      state.t = clamp(t);
      emit();
    },
    play,
    pause,
    toggle: () => (state.playing ? pause() : play()),
    setSpeed(speed) {
      state.speed = speed;
      emit();
    },
    setFollow(follow) {
      state.follow = follow;
      emit();
    },
    subscribe: (listener) => {
      listeners.add(listener);
      return () => {
        listeners.delete(listener);
      };
    },
    dispose() {
      stop();
      listeners.clear();
    },
  };
}

/** A coarse value derived from the clock; the component re-renders only when it changes. */
export function useClock<T extends string | number | boolean>(
  clock: PlaybackClock,
  select: (c: PlaybackClock) => T,
): T {
  return useSyncExternalStore(
    clock.subscribe,
    () => select(clock),
    () => select(clock),
  );
}
