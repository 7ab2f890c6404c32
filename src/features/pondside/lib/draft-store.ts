/**
 * Half-typed forms survive a reload, a dropped tab or a phone that kills the browser in the pocket:
 * each form writes its values to localStorage on every change and reads them back on the next visit.
 */
type Where = 'local' | 'session';
const storage = (where: Where) => (where === 'session' ? globalThis.sessionStorage : globalThis.localStorage);

export function readDraft(key: string, where: Where = 'local'): unknown {
  try {
    const raw = storage(where)?.getItem(key);
    return raw ? (JSON.parse(raw) as unknown) : null;
  } catch {
    return null;
  }
}

export function writeDraft(key: string, value: unknown, where: Where = 'local'): void {
  try {
    storage(where)?.setItem(key, JSON.stringify(value));
  } catch {
    /* storage full or blocked: the form still works, it just won't survive a reload */
  }
}

export function clearDraft(key: string, where: Where = 'local'): void {
  try {
    storage(where)?.removeItem(key);
  } catch {
    /* ignore */
  }
}

export const pondsideDraftKey = (farmId: string) => `gillwise.pondside.draft.${farmId}`;
/** The result view of the last saved test, kept per tab (sessionStorage) so a reload comes back to it. */
export const pondsideLastKey = (farmId: string) => `gillwise.pondside.last.${farmId}`;
