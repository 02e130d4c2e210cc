import { createContext, useCallback, useContext, useEffect, useId, useLayoutEffect, useState } from 'react';

/** Where a form on the page says it holds edits not applied yet (typed, not submitted). */
const UnsavedEditsContext = createContext<(id: string, unsaved: boolean) => void>(() => {});
export const UnsavedEditsProvider = UnsavedEditsContext.Provider;

/** The forms of a page that hold edits not applied yet: a page guards leaving while any does. */
export function useUnsavedEdits() {
  const [ids, setIds] = useState<ReadonlySet<string>>(() => new Set());
  const report = useCallback((id: string, unsaved: boolean) => {
    setIds((all) => {
      if (all.has(id) === unsaved) return all;
      const next = new Set(all);
      if (unsaved) next.add(id);
      else next.delete(id);
      return next;
    });
  }, []);
  return { count: ids.size, report };
}

/** A form reports whether it holds edits not applied yet, for as long as it is on the page. */
export function useReportUnsaved(unsaved: boolean) {
  const id = useId();
  const report = useContext(UnsavedEditsContext);
  // a layout effect: the page knows before the next key or click (leaving right behind an edit asks)
  useLayoutEffect(() => {
    report(id, unsaved);
  }, [id, unsaved, report]);
  useEffect(() => () => report(id, false), [id, report]);
}
