/**
 * Undo/redo over whole document snapshots (nodes, edges, settings). Snapshots share structure,
 * so keeping 100 is cheap. `commit` records an edit; `replace` changes the present without a history
 * entry (a drag in progress, selection); `apply` records a command run on the present; `undo`/`redo` walk the stacks; `reset` starts afresh (load,
 * reload after a conflict).
 */
export interface History<T> {
  past: T[];
  present: T;
  future: T[];
}

export type HistoryAction<T> =
  | { type: 'commit'; next: T }
  | { type: 'apply'; fn: (present: T) => T }
  | { type: 'replace'; next: T }
  | { type: 'update'; fn: (present: T) => T }
  | { type: 'undo' }
  | { type: 'redo' }
  | { type: 'reset'; next: T }
  | { type: 'mark'; before: T };

export const HISTORY_LIMIT = 100;

/** A fresh history at `present`. */
export function initHistory<T>(present: T): History<T> {
  return { past: [], present, future: [] };
}

/** The history reducer. `mark` records `before` as the state to undo back to (a finished drag). */
export function historyReducer<T>(h: History<T>, a: HistoryAction<T>): History<T> {
  switch (a.type) {
    case 'commit':
      if (a.next === h.present) return h;
      return { past: [...h.past, h.present].slice(-HISTORY_LIMIT), present: a.next, future: [] };
    case 'apply': {
      // A command on the present as the reducer sees it (two key presses before a render each see the last).
      const next = a.fn(h.present);
      if (next === h.present) return h;
      return { past: [...h.past, h.present].slice(-HISTORY_LIMIT), present: next, future: [] };
    }
    case 'replace':
      return a.next === h.present ? h : { ...h, present: a.next };
    case 'update': {
      // For changes that arrive together in one event (selection of an edge and of nodes): each sees the last.
      const next = a.fn(h.present);
      return next === h.present ? h : { ...h, present: next };
    }
    case 'mark':
      if (a.before === h.present) return h;
      return { past: [...h.past, a.before].slice(-HISTORY_LIMIT), present: h.present, future: [] };
    case 'undo': {
      if (h.past.length === 0) return h;
      const prev = h.past[h.past.length - 1];
      return { past: h.past.slice(0, -1), present: prev, future: [h.present, ...h.future] };
    }
    case 'redo': {
      if (h.future.length === 0) return h;
      const [next, ...rest] = h.future;
      return { past: [...h.past, h.present], present: next, future: rest };
    }
    case 'reset':
      return initHistory(a.next);
  }
}
