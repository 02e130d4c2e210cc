import { z } from 'zod';

/** What a change on the live stream names: the kind of record, its id and its version after the write. */
export const CHANGE_KINDS = ['plan', 'station', 'run', 'annotation', 'walkthrough', 'series'] as const;
export type ChangeKind = (typeof CHANGE_KINDS)[number];

/** `event: change` on `GET /api/events`; `deleted` when the record is gone. */
export interface ChangeEvent {
  kind: ChangeKind;
  id: number;
  version?: number;
  deleted?: true;
  /** the plan the record belongs to, when it is a plan's (a run's plan) */
  planId?: number;
}

/** Someone with a screen open on a plan. */
export interface Viewer {
  userId: number;
  name: string;
  role: string;
}

/** `event: presence`: who has a screen open on the plan (each person once). */
export interface PresenceEvent {
  planId: number;
  viewers: Viewer[];
}

/** `event: hello`, first on every stream: the id the client names its stream by in presence calls. */
export interface HelloEvent {
  connection: string;
}

/** `POST /api/events/presence`: the plan this stream's screen shows now (null: none). */
export const PresenceInputSchema = z.strictObject({
  connection: z.string().min(1).max(64),
  planId: z.number().int().positive().nullable(),
});
export type PresenceInput = z.infer<typeof PresenceInputSchema>;
