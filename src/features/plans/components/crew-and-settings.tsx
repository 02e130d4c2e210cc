import { useCallback, useEffect, useMemo, useRef } from 'react';
import { z } from 'zod';
import type { OrbitArcs } from '@shared/compute/orbit';
import { formatLength, metresToFeet, parseGmtStart } from '@shared/compute/units';
import { CrewSlotSchema, type Crew, type CrewMember } from '@shared/schemas/plan';
import { ROUTE_MODES, type RouteMode } from '@shared/schemas/route';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { durationField, lengthText, numberText, optionalBetaText, planField } from '../lib/form-fields';
import { durationText, type PlanDraft } from '../lib/plan-draft';
import { OrbitStartField } from './orbit-start-field';
import { ParsedInput } from './parsed-input';
import { ROUTE_MODE_LABELS } from './route-mode-labels';

const tetherText = lengthText(CrewSlotSchema.shape.tetherLengthM.unwrap());
const phaseText = numberText(planField.orbitPhaseAtStartDeg);
const limitText = durationField(planField.timeLimitSeconds);
const egressText = durationField(planField.egressSeconds);
const ingressText = durationField(planField.ingressSeconds);
const nameSchema = CrewSlotSchema.shape.name;

const fmtLength = (v: number | null) => (v === null ? '' : formatLength(v, 'm', 2).replace(/\.?0+ m$/, ' m'));
const fmtDuration = (v: number | null) => (v === null ? '' : durationText(v));
const fmtNumber = (v: number | null) => (v === null ? '' : String(v));

interface Props {
  draft: PlanDraft;
  onChange: (patch: Partial<PlanDraft>) => void;
  readOnly: boolean;
}

interface SettingsProps extends Props {
  /** the orbit's arcs at the draft's beta angle; undefined while the station loads */
  arcs?: OrbitArcs;
}

export function CrewEditor({ draft, onChange, readOnly }: Props) {
  const setSlot = useCallback(
    (slot: CrewMember, patch: Partial<Crew[CrewMember]>) =>
      onChange({ crew: { ...draft.crew, [slot]: { ...draft.crew[slot], ...patch } } }),
    [draft.crew, onChange],
  );
  return (
    <div className="grid gap-5 md:grid-cols-2">
      {(['EV1', 'EV2'] as const).map((slot) => {
        const name = draft.crew[slot].name;
        const nameError = nameSchema.safeParse(name).success ? undefined : 'name must not be empty';
        return (
          <fieldset key={slot} className="space-y-3 rounded-md border border-surface-line p-3">
            <legend className="px-1 text-sm font-semibold text-text-strong">{slot}</legend>
            <Field label={`${slot} name`} error={nameError}>
              <Input
                className="read-only:bg-surface-sunken"
                value={name}
                readOnly={readOnly}
                onChange={(e) => setSlot(slot, { name: e.target.value })}
              />
            </Field>
            <ParsedInput
              label={`${slot} tether length`}
              hint={`${metresToFeet(draft.crew[slot].tetherLengthM).toFixed(1)} ft · type m or ft, e.g. 85 ft`}
              value={draft.crew[slot].tetherLengthM}
              format={fmtLength}
              schema={tetherText}
              readOnly={readOnly}
              onCommit={(v) => v !== null && setSlot(slot, { tetherLengthM: v })}
            />
          </fieldset>
        );
      })}
    </div>
  );
}

/** A start time on the plan's date shows as `hh:mm`, on another day with its date. */
const startText = (date: string) => (v: string | null) =>
  v === null ? '' : v.slice(0, 10) === date ? v.slice(11, 16) : `${v.slice(0, 10)} ${v.slice(11, 16)}`;

const startSchema = (date: string) =>
  z.string().transform((text, ctx) => {
    const result = parseGmtStart(text, date);
    if (result.ok) return result.value;
    ctx.addIssue({ code: 'custom', message: result.message });
    return z.NEVER;
  });

export function SettingsEditor({ draft, onChange, readOnly, arcs }: SettingsProps) {
  const titleError = planField.title.safeParse(draft.title).success ? undefined : 'title must not be empty';
  const dateOk = z.iso.date().safeParse(draft.date).success;
  const formatStart = useMemo(() => startText(draft.date), [draft.date]);
  const startTextSchema = useMemo(() => startSchema(draft.date), [draft.date]);
  // a start on the EVA date moves with it (the date field is blank for a moment while retyped)
  const lastDate = useRef(draft.date);
  useEffect(() => {
    if (dateOk) lastDate.current = draft.date;
  }, [dateOk, draft.date]);
  const setDate = (date: string) =>
    onChange({
      date,
      ...(draft.startGmt?.slice(0, 10) === lastDate.current && z.iso.date().safeParse(date).success
        ? { startGmt: `${date}${draft.startGmt.slice(10)}` }
        : {}),
    });
  // columns by the form's own width, so the route mode's longest name shows whole in a side column
  return (
    <div className="@container">
      <div className="grid gap-4 @xl:grid-cols-2 @4xl:grid-cols-3">
        <Field label="Title" error={titleError}>
          <Input
            className="read-only:bg-surface-sunken"
            value={draft.title}
            readOnly={readOnly}
            onChange={(e) => onChange({ title: e.target.value })}
          />
        </Field>
        <Field label="EVA date" error={dateOk ? undefined : 'date must be an ISO date (YYYY-MM-DD)'}>
          <Input
            className="read-only:bg-surface-sunken"
            type="date"
            value={draft.date}
            readOnly={readOnly}
            onChange={(e) => setDate(e.target.value)}
          />
        </Field>
        <ParsedInput<string>
          label="Start (GMT)"
          hint="hh:mm GMT on the EVA date; blank: elapsed time only"
          value={draft.startGmt}
          format={formatStart}
          schema={startTextSchema}
          readOnly={readOnly}
          onCommit={(v) => onChange({ startGmt: v })}
        />
        <Field label="Route mode">
          <Select
            options={ROUTE_MODES.map((m) => ({ value: m, label: ROUTE_MODE_LABELS[m] }))}
            value={draft.routeMode}
            disabled={readOnly}
            onChange={(e) => onChange({ routeMode: e.target.value as RouteMode })}
          />
        </Field>
        <ParsedInput
          label="Time limit (h:mm)"
          value={draft.timeLimitSeconds}
          format={fmtDuration}
          schema={limitText}
          readOnly={readOnly}
          onCommit={(v) => v !== null && onChange({ timeLimitSeconds: v })}
        />
        <ParsedInput
          label="Egress (h:mm)"
          value={draft.egressSeconds}
          format={fmtDuration}
          schema={egressText}
          readOnly={readOnly}
          onCommit={(v) => v !== null && onChange({ egressSeconds: v })}
        />
        <ParsedInput
          label="Ingress (h:mm)"
          value={draft.ingressSeconds}
          format={fmtDuration}
          schema={ingressText}
          readOnly={readOnly}
          onCommit={(v) => v !== null && onChange({ ingressSeconds: v })}
        />
        {arcs ? (
          <OrbitStartField
            value={draft.orbitPhaseAtStartDeg}
            arcs={arcs}
            readOnly={readOnly}
            onCommit={(v) => onChange({ orbitPhaseAtStartDeg: v })}
          />
        ) : (
          <ParsedInput
            label="Orbit phase at start (°)"
            hint="0° = orbital sunrise"
            value={draft.orbitPhaseAtStartDeg}
            format={fmtNumber}
            schema={phaseText}
            readOnly={readOnly}
            onCommit={(v) => v !== null && onChange({ orbitPhaseAtStartDeg: v })}
          />
        )}
        <ParsedInput
          label="Beta angle override (°)"
          hint="Blank: the station's beta angle"
          value={draft.betaDegOverride}
          format={fmtNumber}
          schema={optionalBetaText}
          readOnly={readOnly}
          onCommit={(v) => onChange({ betaDegOverride: v })}
        />
        <label className="flex items-center gap-2 self-center text-sm font-medium text-text-strong">
          <input
            type="checkbox"
            className="size-4 accent-accent"
            checked={draft.allowRide}
            disabled={readOnly}
            onChange={(e) => onChange({ allowRide: e.target.checked })}
          />
          Arm ride allowed
        </label>
      </div>
    </div>
  );
}
