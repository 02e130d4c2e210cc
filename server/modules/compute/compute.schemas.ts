import { z } from 'zod';
import { FiniteSchema } from '@shared/schemas/station';

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
