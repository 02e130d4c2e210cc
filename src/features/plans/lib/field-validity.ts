import { createContext, useCallback, useContext, useEffect, useId, useState } from 'react';

/** Where a field whose text does not read as a value says so, so the page's save state counts it. */
export const FieldValidityContext = createContext<(id: string, error: string | undefined) => void>(() => {});

/** The fields of a form that hold text they could not read (their draft value is the last good one). */
export function useFieldValidity() {
  const [errors, setErrors] = useState<Record<string, string>>({});
  const report = useCallback((id: string, error: string | undefined) => {
    setErrors((all) => {
      if (all[id] === error) return all;
      const next = { ...all };
      if (error === undefined) delete next[id];
      else next[id] = error;
      return next;
    });
  }, []);
  return { count: Object.keys(errors).length, report };
}

/** A field reports its own error (or none) for as long as it is on the page. */
export function useReportFieldError(error: string | undefined) {
  const id = useId();
  const report = useContext(FieldValidityContext);
  useEffect(() => {
    report(id, error);
  }, [id, error, report]);
  useEffect(() => () => report(id, undefined), [id, report]);
}
