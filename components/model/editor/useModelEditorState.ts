/**
 * The model editor's state: the open section, the expanded cards, the focused element, the filter, the undo of the
 * last delete, and the row actions (stable for the editor's lifetime: they read the latest model from a ref).
 */
import { useCallback, useLayoutEffect, useMemo, useRef, useState } from 'react';
import type { ModelInput, ModelIssue } from '../../../shared/schemas/model';
import {
  addElement,
  countReferences,
  deleteElement,
  duplicateElement,
  newElement,
  renameElement,
  shiftKeys,
  updateElement,
  type NewVariant,
} from '../edit';
import { scenariosNaming } from '../scenarios';
import {
  COLLECTION_LABELS,
  elementKey,
  groupIssues,
  isCollection,
  itemsOf,
  type CollectionKey,
  type LocatedIssue,
} from '../summaries';
import type { Focus, RowActions, Section } from './types';

export function useModelEditorState(
  model: ModelInput,
  onChange: (m: ModelInput) => void,
  issues: ModelIssue[],
  focusRequest: { collection: string; index: number } | null | undefined,
) {
  const [section, setSection] = useState<Section>('buses');
  const [expanded, setExpanded] = useState<Set<string>>(() => new Set());
  const [focus, setFocus] = useState<Focus | null>(null);
  const [filter, setFilter] = useState('');
  const [undo, setUndo] = useState<{ text: string; before: ModelInput; after: ModelInput } | null>(null);

  // The latest model and callback for the stable row actions below (synced after each render, before any event).
  const modelRef = useRef(model);
  const onChangeRef = useRef(onChange);
  useLayoutEffect(() => {
    modelRef.current = model;
    onChangeRef.current = onChange;
  });
  const commit = useCallback((next: ModelInput) => {
    if (next === modelRef.current) return;
    modelRef.current = next;
    onChangeRef.current(next);
  }, []);
  /** The latest model, for callbacks that must stay stable (the scenarios' rows). */
  const latest = useCallback(() => modelRef.current, []);

  const focusOn = useCallback((key: string, expand: boolean, field?: string) => {
    // A new nonce each time, so asking for the same element again scrolls to it again.
    setFocus((f) => ({ key, nonce: (f?.nonce ?? 0) + 1, ...(field ? { field } : {}) }));
    if (expand) setExpanded((s) => (s.has(key) ? s : new Set(s).add(key)));
  }, []);

  const actions = useMemo<RowActions>(
    () => ({
      patch: (collection, index, update) => commit(updateElement(modelRef.current, collection, index, update)),
      rename: (collection, index, id) => commit(renameElement(modelRef.current, collection, index, id.trim())),
      duplicate: (collection, index) => {
        const r = duplicateElement(modelRef.current, collection, index);
        setExpanded((s) => shiftKeys(s, collection, r.index, 'insert'));
        commit(r.model);
        focusOn(elementKey(collection, r.index), true);
      },
      remove: (collection, index) => {
        const before = modelRef.current;
        const element = itemsOf(before, collection)[index];
        if (!element) return;
        const after = deleteElement(before, collection, index);
        const refs = countReferences(after, element.id);
        const inScenarios =
          scenariosNaming(before, collection, element.id) - scenariosNaming(after, collection, element.id);
        setExpanded((s) => shiftKeys(s, collection, index, 'delete'));
        setFocus(null);
        setUndo({
          text: `Deleted ${COLLECTION_LABELS[collection].singular} ${element.id || `#${index + 1}`}${refs ? ` — ${refs} reference${refs === 1 ? '' : 's'} to it now point nowhere` : ''}${inScenarios ? ` — its override${inScenarios === 1 ? '' : 's'} in ${inScenarios} scenario${inScenarios === 1 ? '' : 's'} removed` : ''}`,
          before,
          after,
        });
        commit(after);
      },
      toggle: (key) =>
        setExpanded((s) => {
          const next = new Set(s);
          if (next.has(key)) next.delete(key);
          else next.add(key);
          return next;
        }),
    }),
    [commit, focusOn],
  );

  const add = (collection: CollectionKey, variant?: NewVariant) => {
    const r = addElement(modelRef.current, collection, newElement(modelRef.current, collection, variant));
    setFilter('');
    commit(r.model);
    focusOn(elementKey(collection, r.index), true);
  };

  // Issues are grouped against the model they may point into (indexes resolved to the current elements).
  const grouped = useMemo(() => groupIssues(issues, model), [issues, model]);

  const jump = useCallback(
    (li: LocatedIssue) => {
      if (li.collection) setSection(li.collection);
      else setSection('general');
      setFilter('');
      if (li.key) focusOn(li.key, true, li.field);
    },
    [focusOn],
  );

  // A focus request from outside (the system tree) opens its element once per request.
  const [seenRequest, setSeenRequest] = useState(focusRequest);
  if (focusRequest !== seenRequest) {
    setSeenRequest(focusRequest);
    if (focusRequest && isCollection(focusRequest.collection)) {
      setSection(focusRequest.collection);
      setFilter('');
      focusOn(elementKey(focusRequest.collection, focusRequest.index), true);
    }
  }

  return {
    section,
    setSection,
    expanded,
    focus,
    filter,
    setFilter,
    undo,
    setUndo,
    commit,
    latest,
    actions,
    add,
    grouped,
    jump,
  };
}
