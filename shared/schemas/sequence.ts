import { z } from 'zod';
import { UpdatePlanInputSchema } from './plan';

/** `POST /api/plans/:id/timeline-preview`: any of the plan's fields, laid over the saved plan; nothing is saved. */
export const PreviewPlanInputSchema = UpdatePlanInputSchema.omit({ version: true });
export type PreviewPlanInput = z.infer<typeof PreviewPlanInputSchema>;
