/** Small key-value storage: localStorage on the web, memory elsewhere (and in tests without it). */
const memory = new Map<string, string>();

function local(): Storage | null {
  try {
    return typeof globalThis.localStorage === 'undefined' ? null : globalThis.localStorage;
  } catch {
    return null;
  }
}

export const storage = {
  get(key: string): string | null {
    return local()?.getItem(key) ?? memory.get(key) ?? null;
  },
  set(key: string, value: string): void {
    const ls = local();
    if (ls) ls.setItem(key, value);
    else memory.set(key, value);
  },
  remove(key: string): void {
    local()?.removeItem(key);
    memory.delete(key);
  },
};
