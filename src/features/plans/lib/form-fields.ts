import { z } from 'zod';
import { orbitSummary, type OrbitArcs, type OrbitEvent, type OrbitStart } from '@shared/compute/orbit';
import { parseDuration, parseLength } from '@shared/compute/units';
import type { OrbitSettings } from '@shared/schemas/station';
import { UpdatePlanInputSchema } from '@shared/schemas/plan';

type Parse = (text: string) => { ok: true; value: number } | { ok: false; message: string };

/** A text field read by one of the unit parsers, then checked by the contract's own field schema. */
const parsedText = <T extends z.ZodType<number, number>>(parse: Parse, schema: T) =>
  z
    .string()
    .transform((text, ctx) => {
      const result = parse(text);
      if (result.ok) return result.value;
      ctx.addIssue({ code: 'custom', message: result.message });
      return z.NEVER;
    })
    .pipe(schema);

export const lengthText = <T extends z.ZodType<number, number>>(schema: T) =>
  parsedText((t) => parseLength(t, 'm'), schema);
export const durationField = <T extends z.ZodType<number, number>>(schema: T) =>
  parsedText(parseDuration, schema);
export const numberText = <T extends z.ZodType<number, number>>(schema: T) =>
  parsedText((t) => {
    const value = Number(t.trim());
    return t.trim() !== '' && Number.isFinite(value)
      ? { ok: true, value }
      : { ok: false, message: 'enter a number' };
  }, schema);

/** The plan contract's field schemas without their PATCH optionality. */
export const planField = {
  title: UpdatePlanInputSchema.shape.title.unwrap(),
  date: UpdatePlanInputSchema.shape.date.unwrap(),
  routeMode: UpdatePlanInputSchema.shape.routeMode.unwrap(),
  orbitPhaseAtStartDeg: UpdatePlanInputSchema.shape.orbitPhaseAtStartDeg.unwrap(),
  betaDegOverride: UpdatePlanInputSchema.shape.betaDegOverride.unwrap().unwrap(),
  timeLimitSeconds: UpdatePlanInputSchema.shape.timeLimitSeconds.unwrap(),
  egressSeconds: UpdatePlanInputSchema.shape.egressSeconds.unwrap(),
  ingressSeconds: UpdatePlanInputSchema.shape.ingressSeconds.unwrap(),
};

/** Blank means "use the station's default beta angle". */
export const optionalBetaText = z.union([
  z.literal('').transform(() => undefined),
  numberText(planField.betaDegOverride),
]);

/** The start as a planner gives it: minutes after or before orbital sunrise or sunset. */
export const orbitStartFields = {
  minutes: numberText(
    z
      .number()
      .min(0, 'minutes must not be negative')
      .max(120, 'at most 120 min: an orbit is about 90 min, so count from the nearer sunrise or sunset'),
  ),
  side: z.enum(['after', 'before']),
  event: z.enum(['sunrise', 'sunset']),
};
export type OrbitStartSide = z.infer<typeof orbitStartFields.side>;

/** Minutes and a side as the signed offset the orbit computations take. */
export const orbitStartOf = (minutes: number, side: OrbitStartSide, event: OrbitEvent): OrbitStart => ({
  event,
  offsetSeconds: (side === 'before' ? -minutes : minutes) * 60,
});

/** The orbit's arcs for a station's orbit and the plan's beta angle override (blank: the station's). */
export const planOrbitArcs = (orbit: OrbitSettings, betaDegOverride: number | null | undefined): OrbitArcs =>
  orbitSummary({ altitudeKm: orbit.altitudeKm, betaDeg: betaDegOverride ?? orbit.betaDeg });
