import { z } from 'zod';
import { RouteModeSchema, RouteRequestSchema, type RouteMode } from '@shared/schemas/route';
import { KeySchema } from '@shared/schemas/station';
import { fromMetres, LENGTH_UNITS, toMetres, type LengthUnit } from '@shared/compute/units';
import type { RouteParams } from '../api/get-route';

/** A node end being picked in 3D. */
export type PickField = 'from' | 'to';

export interface PickedNode {
  field: PickField;
  key: string;
  /** bumps on every pick so picking the same node twice still applies */
  seq: number;
}

/** The route finder's fields as typed; the tether is read in the chosen unit and sent in metres. */
export function routeFormSchema(knownKeys: ReadonlySet<string>) {
  const known = KeySchema.refine((k) => knownKeys.has(k), 'no node of this station has that key');
  return z
    .object({
      from: known,
      to: known,
      mode: RouteModeSchema,
      tether: z.string().trim().min(1, 'enter the tether length'),
      unit: z.enum(LENGTH_UNITS),
      carrying: z.boolean(),
      allowRide: z.boolean(),
    })
    .superRefine((v, ctx) => {
      if (v.from === v.to)
        ctx.addIssue({ code: 'custom', path: ['to'], message: 'choose a node other than From' });
      const metres = toMetres(Number(v.tether), v.unit);
      const checked = RouteRequestSchema.shape.tetherLengthM.safeParse(metres);
      if (!checked.success) {
        ctx.addIssue({
          code: 'custom',
          path: ['tether'],
          message: checked.error.issues[0]?.message ?? 'enter a number',
        });
      }
    });
}

export type RouteFormValues = z.infer<ReturnType<typeof routeFormSchema>>;

export function toRouteParams(v: RouteFormValues): { params: RouteParams; mode: RouteMode } {
  return {
    mode: v.mode,
    params: {
      from: v.from,
      to: v.to,
      tetherLengthM: toMetres(Number(v.tether), v.unit),
      carrying: v.carrying,
      allowRide: v.allowRide,
    },
  };
}

/** A tether length for the field, in `unit`, to a tenth. */
export const tetherText = (metres: number, unit: LengthUnit) =>
  String(Math.round(fromMetres(metres, unit) * 10) / 10);
