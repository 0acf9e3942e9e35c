/**
 * The working draft of a scenario kept in the browser (localStorage) while its edits are unsaved, so that leaving the
 * page, a reload or a crash loses nothing. One draft per scenario, with the revision it was edited from and when.
 * The storage is passed in, so this runs in plain Node tests with a Map-backed fake.
 */

/** What a kept draft holds. */
export interface KeptDraft<S> {
  /** The revision the edits started from. */
  baseRevisionId: string;
  /** The edited scenario. */
  scenario: S;
  /** When it was last written, ms since the epoch. */
  savedAt: number;
}

type KeyValueStore = Pick<Storage, "getItem" | "setItem" | "removeItem">;

const key = (scenarioId: string) => `quell:draft:${scenarioId}`;

export function readDraft<S>(store: KeyValueStore | null, scenarioId: string): KeptDraft<S> | null {
  if (!store) return null;
  try {
    const raw = store.getItem(key(scenarioId));
    if (!raw) return null;
    const d = JSON.parse(raw) as Partial<KeptDraft<S>>;
    if (typeof d.baseRevisionId !== "string" || typeof d.savedAt !== "number" || d.scenario === undefined) return null;
    return d as KeptDraft<S>;
  } catch {
    return null;
  }
}

export function writeDraft<S>(store: KeyValueStore | null, scenarioId: string, draft: KeptDraft<S>): void {
  if (!store) return;
  try {
    store.setItem(key(scenarioId), JSON.stringify(draft));
  } catch {
    // A full or blocked storage: the edits stay in the page, as before.
  }
}

export function dropDraft(store: KeyValueStore | null, scenarioId: string): void {
  if (!store) return;
  try {
    store.removeItem(key(scenarioId));
  } catch {
    // nothing kept, nothing to drop
  }
}

/** The page's localStorage, or null where there is none (server, blocked storage). */
export function browserStorage(): KeyValueStore | null {
  try {
    return typeof window !== "undefined" ? window.localStorage : null;
  } catch {
    return null;
  }
}
