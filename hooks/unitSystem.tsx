/**
 * The signed-in user's unit system (US customary or SI): a preference kept on this device per user (local storage);
 * until one is chosen, the organization's label unit order decides (US first → US customary). Every length field
 * and reading of the editor, the spot check and the results follows it; stored values are SI and never change by a
 * switch. `UnitSystemProvider` (in the signed-in layout) reads it once; `useUnitSystem()` is a context read.
 */
import React, { createContext, useCallback, useContext, useMemo, useSyncExternalStore } from 'react';
import { useOrganization } from './queries';
import { useSession } from './session';
import { storage } from './storage';
import type { UnitSystem } from './units';

export interface UnitSystemValue {
  system: UnitSystem;
  /** false while the organization's default applies */
  chosen: boolean;
  setSystem: (s: UnitSystem) => void;
}

const listeners = new Set<() => void>();
const key = (userId: string) => `emberline.units.${userId}`;

function read(userId: string | undefined): UnitSystem | null {
  if (!userId) return null;
  const v = storage.get(key(userId));
  return v === 'us' || v === 'si' ? v : null;
}

function subscribe(l: () => void) {
  listeners.add(l);
  return () => {
    listeners.delete(l);
  };
}

const Ctx = createContext<UnitSystemValue>({ system: 'si', chosen: false, setSystem: () => undefined });

export function UnitSystemProvider({ children }: { children: React.ReactNode }) {
  const userId = useSession().user?.id;
  const get = useCallback(() => read(userId), [userId]);
  const stored = useSyncExternalStore(subscribe, get, get);
  const org = useOrganization();
  const fallback: UnitSystem = org.data?.settings.labelUnitOrder === 'us-first' ? 'us' : 'si';
  const setSystem = useCallback(
    (s: UnitSystem) => {
      if (!userId) return;
      storage.set(key(userId), s);
      for (const l of listeners) l();
    },
    [userId],
  );
  const value = useMemo(
    () => ({ system: stored ?? fallback, chosen: stored !== null, setSystem }),
    [stored, fallback, setSystem],
  );
  return <Ctx.Provider value={value}>{children}</Ctx.Provider>;
}

/** The unit system in force and a setter (which keeps it for this user on this device). */
export function useUnitSystem(): UnitSystemValue {
  return useContext(Ctx);
}
