import type { RunEvent, RunEventInput, RunSummary } from '@shared/schemas/run';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { runKeys } from './keys';

export const openRun = ({ planId, startedAt }: { planId: number; startedAt: string }): Promise<RunSummary> =>
  api.post(`/plans/${planId}/runs`, { startedAt });

export function useOpenRun({ planId, onSuccess }: { planId: number; onSuccess?: (run: RunSummary) => void }) {
  return useInvalidatingMutation({ mutationFn: openRun, invalidates: [runKeys.ofPlan(planId)], onSuccess });
}

export const logRunEvent = ({
  runId,
  ...body
}: RunEventInput & { runId: number }): Promise<{ event: RunEvent; version: number }> =>
  api.post(`/runs/${runId}/events`, body);

/** Appends an event with the run's version the logger saw; a 409 means someone logged meanwhile. */
export function useLogRunEvent(runId: number) {
  return useInvalidatingMutation({ mutationFn: logRunEvent, invalidates: [runKeys.detail(runId)] });
}
