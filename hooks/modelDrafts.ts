import { useEffect, useSyncExternalStore } from 'react';
import { Platform } from 'react-native';
import type { ModelInput } from '../shared/schemas/model';

/**
 * Unsaved model edits, one per study, kept outside the model panel so that switching the study's tabs (which unmounts
 * the panel) and coming back keeps them. Only edited models are held: a study without an entry shows the server's
 * copy. `baseVersion` is the model version the edits started from, sent with the save for the version check.
 */
export interface ModelDraft {
  draft: ModelInput;
  baseVersion: number;
  dirty: boolean;
}

let drafts: ReadonlyMap<string, ModelDraft> = new Map();
const listeners = new Set<() => void>();

function publish(next: Map<string, ModelDraft>): void {
  drafts = next;
  listeners.forEach((l) => l());
}

function subscribe(l: () => void): () => void {
  listeners.add(l);
  return () => listeners.delete(l);
}

export function getModelDraft(studyId: string): ModelDraft | undefined {
  return drafts.get(studyId);
}

/** Records an edit; a draft that is not dirty is dropped (the server's copy is shown again). */
export function setModelDraft(studyId: string, entry: ModelDraft): void {
  const next = new Map(drafts);
  if (entry.dirty) next.set(studyId, entry);
  else next.delete(studyId);
  publish(next);
}

export function clearModelDraft(studyId: string): void {
  if (!drafts.has(studyId)) return;
  const next = new Map(drafts);
  next.delete(studyId);
  publish(next);
}

/**
 * After a save of `saved` (made from `fromVersion`) became `newVersion`: the draft that was saved is dropped (the
 * server's copy is now the same); edits made while the save was under way stay, now based on the new version.
 */
export function settleModelDraft(studyId: string, saved: unknown, fromVersion: number, newVersion: number): void {
  const d = drafts.get(studyId);
  if (!d) return;
  if (d.draft === saved) clearModelDraft(studyId);
  else if (d.baseVersion === fromVersion) setModelDraft(studyId, { ...d, baseVersion: newVersion });
}

/** Drops every draft (sign-out: the next person on this browser must not see them). */
export function clearModelDrafts(): void {
  if (drafts.size) publish(new Map());
}

export function hasDirtyDraft(studyId?: string): boolean {
  if (studyId !== undefined) return drafts.get(studyId)?.dirty ?? false;
  for (const d of drafts.values()) if (d.dirty) return true;
  return false;
}

/** The draft of one study, re-rendering when it changes. */
export function useModelDraft(studyId: string): ModelDraft | undefined {
  return useSyncExternalStore(
    subscribe,
    () => drafts.get(studyId),
    () => undefined,
  );
}

const anyDirty = () => hasDirtyDraft();

/** On the web, the browser asks before the page is closed or reloaded while any model has unsaved changes. */
export function useWarnBeforeUnload(): void {
  const dirty = useSyncExternalStore(subscribe, anyDirty, () => false);
  useEffect(() => {
    if (!dirty || Platform.OS !== 'web' || typeof window === 'undefined') return;
    const onBeforeUnload = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      // Older browsers show the prompt only when returnValue is set.
      e.returnValue = '';
    };
    window.addEventListener('beforeunload', onBeforeUnload);
    return () => window.removeEventListener('beforeunload', onBeforeUnload);
  }, [dirty]);
}

export const LEAVE_MESSAGE = 'The model has unsaved changes. Leave the study and discard them?';

/** Before signing out: true when no model has unsaved changes or the person agrees to discard them (web). */
export function confirmDiscardingDrafts(): boolean {
  if (!hasDirtyDraft() || Platform.OS !== 'web' || typeof window === 'undefined') return true;
  return window.confirm('A model has unsaved changes. Sign out and discard them?');
}

/**
 * On the web, a link that leaves the study (any path outside /studies/<id>) asks first while its model has unsaved
 * changes; leaving discards the draft, staying cancels the navigation. Links inside the study (tabs, bus traces) keep
 * the draft without asking. Listens in the capture phase, before the router's own click handler.
 */
export function useConfirmLeavingStudy(studyId: string): void {
  useEffect(() => {
    if (Platform.OS !== 'web' || typeof document === 'undefined') return;
    const onClick = (e: MouseEvent) => {
      if (!hasDirtyDraft(studyId) || e.defaultPrevented || e.button !== 0) return;
      const anchor = (e.target as Element | null)?.closest?.('a[href]') as HTMLAnchorElement | null | undefined;
      // A download (blob link) or a new window leaves nothing.
      if (!anchor || anchor.hasAttribute('download') || (anchor.target && anchor.target !== '_self')) return;
      const url = new URL(anchor.href, window.location.href);
      if (!/^https?:$/.test(url.protocol) || url.origin !== window.location.origin) return;
      const inside = `/studies/${encodeURIComponent(studyId)}`;
      if (url.pathname === inside || url.pathname.startsWith(`${inside}/`)) return;
      if (window.confirm(LEAVE_MESSAGE)) {
        clearModelDraft(studyId);
        return;
      }
      e.preventDefault();
      e.stopPropagation();
    };
    document.addEventListener('click', onClick, true);
    return () => document.removeEventListener('click', onClick, true);
  }, [studyId]);
}
