import { z } from 'zod';
import { FiniteSchema, KeySchema, Vec3Schema } from '@shared/schemas/station';

/** `?altitudeKm=&betaDeg=` of `GET /api/orbit`: query strings, read as finite numbers. */
const queryNumber = (what: string, min: number, max: number) =>
  z
    .string({ error: `${what} is required` })
    .trim()
    .min(1, `${what} is required`)
    .transform(Number)
    .pipe(FiniteSchema.refine((v) => v >= min && v <= max, `${what} must be between ${min} and ${max}`));

export const OrbitQuerySchema = z.object({
  altitudeKm: queryNumber('altitudeKm', 100, 40000),
  betaDeg: queryNumber('betaDeg', -90, 90),
});
export type OrbitQuery = z.infer<typeof OrbitQuerySchema>;

const NonZeroVec3Schema = Vec3Schema.refine(
  (v) => Math.hypot(...v) > 1e-9,
  'a normal must not be the zero vector',
);

/** Body of `POST /api/stations/:id/socket-plan/accept`: the planned sockets to add to the model. */
export const AcceptSocketPlanInputSchema = z.strictObject({
  version: z.number().int('version must be a whole number').min(1, 'version must be at least 1'),
  sockets: z
    .array(
      z.strictObject({
        position: Vec3Schema,
        normal: NonZeroVec3Schema,
        key: KeySchema.optional(),
        label: z.string().trim().max(200, 'label must be at most 200 characters').optional(),
      }),
    )
    .min(1, 'give at least one socket')
    .max(500, 'at most 500 sockets at once'),
});
export type AcceptSocketPlanInput = z.infer<typeof AcceptSocketPlanInputSchema>;
