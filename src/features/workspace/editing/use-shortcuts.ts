/**
 * The workspace's keyboard shortcuts on the window: each action calls its handler; none fires while
 * a dialog is open, typing in a field triggers only save, and a read-only view ignores edits.
 */
import { useEffect, useRef } from 'react';
import { shortcutOf, type ShortcutAction } from './shortcuts.ts';

const EDITS: ShortcutAction[] = ['undo', 'redo', 'paste', 'delete', 'save'];

function inField(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  return !!el && (el.tagName === 'INPUT' || el.tagName === 'TEXTAREA' || el.tagName === 'SELECT' || el.isContentEditable);
}

/** Binds the shortcuts to `handlers` (read through a ref, so new handler objects do not rebind). */
export function useShortcuts(readOnly: boolean, handlers: Record<ShortcutAction, () => void>): void {
  const ref = useRef(handlers);
  ref.current = handlers;
  useEffect(() => {
    function onKey(e: KeyboardEvent) {
      if (document.querySelector('[role="dialog"]')) return;
      const action = shortcutOf(e, inField(e.target));
      if (!action) return;
      if (readOnly && EDITS.includes(action)) return;
      e.preventDefault();
      ref.current[action]();
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [readOnly]);
}
