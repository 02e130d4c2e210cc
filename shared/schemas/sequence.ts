import { z } from 'zod';
import { UpdatePlanInputSchema } from './plan';

/** `POST /api/plans/:id/timeline-preview`: any of the plan's fields, laid over the saved plan; nothing is saved. */
export const PreviewPlanInputSchema = UpdatePlanInputSchema.omit({ version: true });
export type PreviewPlanInput = z.infer<typeof PreviewPlanInputSchema>;

/** Longest time budget a proposal may be given, in milliseconds. */
export const MAX_SEQUENCE_BUDGET_MS = 10_000;

/** `POST /api/plans/:id/sequence`: the search's time budget (default 2 s), nothing else. */
export const SequenceInputSchema = z.strictObject({
  budgetMs: z
    .number()
    .int('must be a whole number of milliseconds')
    .min(100, 'at least 100 ms')
    .max(MAX_SEQUENCE_BUDGET_MS, `at most ${MAX_SEQUENCE_BUDGET_MS} ms`)
    .optional(),
});
export type SequenceInput = z.infer<typeof SequenceInputSchema>;

/** One order's day in a few figures, to set a proposal beside the current order. */
export interface OrderSummary {
  endSeconds: number;
  marginSeconds: number;
  swapCount: number;
  /** waiting, both crew members together */
  waitSeconds: number;
  warningCount: number;
  /** warning codes with how often each comes */
  warnings: Record<string, number>;
}

/** The answer of `POST /api/plans/:id/sequence`. */
export interface PlanSequence {
  /** the plan's task ids in the proposed order */
  tasks: number[];
  endSeconds: number;
  currentEndSeconds: number;
  /** proved the earliest end among the orders allowed */
  exact: boolean;
  /** days computed in the search */
  explored: number;
  /** wall-clock seconds the search took */
  seconds: number;
  current: OrderSummary;
  proposal: OrderSummary;
}
