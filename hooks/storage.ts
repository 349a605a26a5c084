/** Small key-value store for the session: localStorage on the web, memory elsewhere. */
const memory = new Map<string, string>();

function local(): Storage | null {
  try {
    return typeof window !== 'undefined' && window.localStorage ? window.localStorage : null;
  } catch {
    return null;
  }
}

export const storage = {
  get(key: string): string | null {
    return local()?.getItem(key) ?? memory.get(key) ?? null;
  },
  set(key: string, value: string): void {
    const l = local();
    if (l) l.setItem(key, value);
    else memory.set(key, value);
  },
  remove(key: string): void {
    local()?.removeItem(key);
    memory.delete(key);
  },
};
