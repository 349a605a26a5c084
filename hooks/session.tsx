import { useQueryClient } from '@tanstack/react-query';
import React, { createContext, useCallback, useContext, useEffect, useMemo, useState } from 'react';
import type { SignInResponse, User } from '../shared/schemas/auth';
import { contract } from '../shared/api';
import { callApi, onUnauthorized, TOKEN_KEY } from './api';
import { clearModelDrafts } from './modelDrafts';
import { storage } from './storage';

const USER_KEY = 'emberline.user';

interface SessionValue {
  user: User | null;
  ready: boolean;
  signIn(email: string, password: string): Promise<User>;
  signOut(): Promise<void>;
  /** Takes a session the API handed out (a changed password, an accepted invitation, a reset): stores its token. */
  adopt(res: SignInResponse): User;
}

const SessionContext = createContext<SessionValue | null>(null);

/** The user stored beside a token, or nobody (an unreadable entry is dropped). */
function readStoredUser(): User | null {
  const saved = storage.get(USER_KEY);
  if (!saved || !storage.get(TOKEN_KEY)) return null;
  try {
    return JSON.parse(saved) as User;
  } catch {
    storage.remove(TOKEN_KEY);
    storage.remove(USER_KEY);
    return null;
  }
}

/** Keeps the signed-in user across reloads (token in storage), and drops it when the server says 401. */
export function SessionProvider({ children }: { children: React.ReactNode }) {
  const queryClient = useQueryClient();
  // The stored session is read synchronously on the first render (local storage), so the app is ready at once.
  const [user, setUser] = useState<User | null>(readStoredUser);
  const ready = true;

  const clear = useCallback(() => {
    storage.remove(TOKEN_KEY);
    storage.remove(USER_KEY);
    setUser(null);
    queryClient.clear();
    clearModelDrafts();
  }, [queryClient]);

  useEffect(() => {
    // Check the stored token once: a deactivated user or an expired token signs out.
    if (storage.get(TOKEN_KEY)) callApi(contract.auth.me).catch(() => undefined);
    return onUnauthorized(clear);
  }, [clear]);

  const signIn = useCallback(async (email: string, password: string) => {
    const res = await callApi(contract.auth.signIn, { body: { email, password } });
    storage.set(TOKEN_KEY, res.token);
    storage.set(USER_KEY, JSON.stringify(res.user));
    setUser(res.user);
    return res.user;
  }, []);

  const adopt = useCallback(
    (res: SignInResponse) => {
      let previousId: string | null = null;
      try {
        previousId = (JSON.parse(storage.get(USER_KEY) ?? 'null') as User | null)?.id ?? null;
      } catch {
        /* unreadable: treat as nobody */
      }
      // Another person's session on this browser: drop what was cached for them.
      if (previousId !== res.user.id) queryClient.clear();
      storage.set(TOKEN_KEY, res.token);
      storage.set(USER_KEY, JSON.stringify(res.user));
      setUser(res.user);
      return res.user;
    },
    [queryClient],
  );

  const signOut = useCallback(async () => {
    try {
      await callApi(contract.auth.signOut);
    } catch {
      /* the token is dropped either way */
    }
    clear();
  }, [clear]);

  const value = useMemo(() => ({ user, ready, signIn, signOut, adopt }), [user, ready, signIn, signOut, adopt]);
  return <SessionContext.Provider value={value}>{children}</SessionContext.Provider>;
}

export function useSession(): SessionValue {
  const v = useContext(SessionContext);
  if (!v) throw new Error('useSession outside SessionProvider');
  return v;
}

/** The signed-in user; only for screens inside the guarded (app) group. */
export function useUser(): User {
  const { user } = useSession();
  if (!user) throw new Error('useUser without a signed-in user');
  return user;
}
