/**
 * Undo and redo for the tile editor: the plan after each committed edit, at most `limit`
 * steps back. Plans are immutable values (see paint.ts), so a step is one reference.
 */
export interface History<T> {
  past: T[];
  present: T;
  future: T[];
}

/** Undo steps kept; a 200 × 200 plan is 160 kB, so 100 steps stay near 16 MB. */
export const HISTORY_LIMIT = 100;

export function historyOf<T>(present: T): History<T> {
  return { past: [], present, future: [] };
}

/** Records `next` as the present; the same value as now is not a step. Redo steps are dropped. */
export function historyPush<T>(history: History<T>, next: T, limit = HISTORY_LIMIT): History<T> {
  if (next === history.present) return history;
  const past = [...history.past, history.present];
  return { past: past.length > limit ? past.slice(past.length - limit) : past, present: next, future: [] };
}

export function historyUndo<T>(history: History<T>): History<T> {
  if (history.past.length === 0) return history;
  return { past: history.past.slice(0, -1), present: history.past[history.past.length - 1], future: [history.present, ...history.future] };
}

export function historyRedo<T>(history: History<T>): History<T> {
  if (history.future.length === 0) return history;
  return { past: [...history.past, history.present], present: history.future[0], future: history.future.slice(1) };
}
