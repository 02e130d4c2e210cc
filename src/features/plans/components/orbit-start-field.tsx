import {
  useEffect,
  useRef,
  useState,
  type InputHTMLAttributes,
  type ReactNode,
  type Ref,
  type SelectHTMLAttributes,
} from 'react';
import {
  orbitStartArcText,
  orbitStartOfPhase,
  orbitStartText,
  phaseOfOrbitStart,
  type OrbitArcs,
  type OrbitEvent,
} from '@shared/compute/orbit';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { useReportFieldError } from '../lib/field-validity';
import { orbitStartFields, orbitStartOf, type OrbitStartSide } from '../lib/form-fields';

const SIDES = [
  { value: 'after', label: 'after' },
  { value: 'before', label: 'before' },
];
const EVENTS = [
  { value: 'sunrise', label: 'orbital sunrise' },
  { value: 'sunset', label: 'orbital sunset' },
];

/** "in daylight, sunset 42 min later · phase 7.8°": the arc the start falls in, and the stored angle. */
export function orbitStartHint(phaseDeg: number, arcs: OrbitArcs) {
  return `${orbitStartArcText(orbitStartOfPhase(phaseDeg, arcs))} · phase ${phaseDeg.toFixed(1)}°`;
}

/** "starts 12 min after orbital sunrise" for a phase at start on this orbit. */
export const orbitStartWords = (phaseDeg: number, arcs: OrbitArcs) =>
  orbitStartText(orbitStartOfPhase(phaseDeg, arcs));

interface ControlsProps {
  minutes: InputHTMLAttributes<HTMLInputElement> & { ref?: Ref<HTMLInputElement> };
  side: SelectHTMLAttributes<HTMLSelectElement> & { ref?: Ref<HTMLSelectElement> };
  event: SelectHTMLAttributes<HTMLSelectElement> & { ref?: Ref<HTMLSelectElement> };
  hint?: ReactNode;
  error?: string;
}

/** `[12] min [after] [orbital sunrise]`: the EVA's start in the orbit, as a planner says it. */
export function OrbitStartControls({ minutes, side, event, hint, error }: ControlsProps) {
  return (
    <fieldset className="space-y-1.5 sm:col-span-2">
      <legend className="mb-1.5 block text-sm font-medium text-text-strong">Start in the orbit</legend>
      <div className="flex flex-wrap items-center gap-2 text-sm text-text-strong">
        <div className="w-20">
          <Input
            inputMode="decimal"
            autoComplete="off"
            className="read-only:bg-surface-sunken"
            aria-label="Start: minutes"
            aria-invalid={error ? true : undefined}
            {...minutes}
          />
        </div>
        <span aria-hidden="true">min</span>
        <div className="w-28">
          <Select options={SIDES} aria-label="Start: after or before" {...side} />
        </div>
        <div className="w-40">
          <Select options={EVENTS} aria-label="Start: orbit event" {...event} />
        </div>
      </div>
      {hint && <p className="text-xs text-text-muted">{hint}</p>}
      <p aria-live="polite" className="text-sm text-danger empty:hidden">
        {error}
      </p>
    </fieldset>
  );
}

interface OrbitStartFieldProps {
  /** the stored phase at start, degrees (0° is orbital sunrise) */
  value: number;
  arcs: OrbitArcs;
  onCommit: (phaseDeg: number) => void;
  readOnly: boolean;
}

const formOf = (phaseDeg: number, arcs: OrbitArcs) => {
  const r = orbitStartOfPhase(phaseDeg, arcs);
  // read back to the minute, as the start is said everywhere; a planner may still type tenths
  const minutes = Math.round(Math.abs(r.offsetSeconds) / 60);
  return {
    text: String(minutes),
    side: (r.offsetSeconds < 0 && minutes > 0 ? 'before' : 'after') as OrbitStartSide,
    event: r.event,
  };
};

/**
 * The plan's start in the orbit, edited as minutes from sunrise or sunset and stored as the phase.
 * The planner's own wording stays while it is the stored phase; a phase changed elsewhere is read
 * again from the nearer sunrise or sunset.
 */
export function OrbitStartField({ value, arcs, onCommit, readOnly }: OrbitStartFieldProps) {
  const [form, setForm] = useState(() => formOf(value, arcs));
  const [error, setError] = useState<string>();
  const committed = useRef(value);
  const seenArcs = useRef(arcs);
  useReportFieldError(readOnly ? undefined : error);

  // another beta angle moves sunset: the stored phase stays, and is read again
  useEffect(() => {
    const sameArcs =
      seenArcs.current.periodSeconds === arcs.periodSeconds &&
      seenArcs.current.sunlitSeconds === arcs.sunlitSeconds;
    if (sameArcs && Math.abs(committed.current - value) < 1e-9) return;
    committed.current = value;
    seenArcs.current = arcs;
    setForm(formOf(value, arcs));
    setError(undefined);
  }, [value, arcs]);

  const edit = (next: typeof form) => {
    setForm(next);
    const parsed = orbitStartFields.minutes.safeParse(next.text);
    setError(parsed.success ? undefined : parsed.error.issues[0]?.message);
    if (!parsed.success) return;
    const phase = phaseOfOrbitStart(orbitStartOf(parsed.data, next.side, next.event), arcs);
    committed.current = phase;
    if (Math.abs(phase - value) > 1e-9) onCommit(phase);
  };

  return (
    <OrbitStartControls
      minutes={{ value: form.text, readOnly, onChange: (e) => edit({ ...form, text: e.target.value }) }}
      side={{
        value: form.side,
        disabled: readOnly,
        onChange: (e) => edit({ ...form, side: e.target.value as OrbitStartSide }),
      }}
      event={{
        value: form.event,
        disabled: readOnly,
        onChange: (e) => edit({ ...form, event: e.target.value as OrbitEvent }),
      }}
      hint={error ? undefined : orbitStartHint(value, arcs)}
      error={error}
    />
  );
}
