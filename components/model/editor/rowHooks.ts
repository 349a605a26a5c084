/** What the table rows and the phone cards share. */
import { useEffect, useMemo, useRef } from 'react';
import { Platform, View } from 'react-native';
import { type Column } from '../columns';
import { matchField, type AnyElement, type LocatedIssue } from '../summaries';

/** Issue messages by column (-1: the element as a whole). */
export function useIssueColumns(issues: readonly LocatedIssue[], columns: Column<AnyElement>[]) {
  return useMemo(() => {
    const byColumn = new Map<number, LocatedIssue[]>();
    for (const li of issues) {
      const c = matchField(li.field, columns);
      const list = byColumn.get(c);
      if (list) list.push(li);
      else byColumn.set(c, [li]);
    }
    return byColumn;
  }, [issues, columns]);
}

/** Scrolls the element into view when it becomes the focus of a jump (web). */
export function useScrollIntoView(focused: number) {
  const ref = useRef<View>(null);
  useEffect(() => {
    if (!focused || Platform.OS !== 'web') return;
    const node = ref.current as unknown as { scrollIntoView?: (o: object) => void } | null;
    // After the section and card have rendered.
    const id = setTimeout(() => node?.scrollIntoView?.({ block: 'center', behavior: 'smooth' }), 30);
    return () => clearTimeout(id);
  }, [focused]);
  return ref;
}
