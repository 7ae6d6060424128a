/** The workspace's keyboard shortcuts (one list: the key handler and the help overlay both read it). */
export interface Shortcut {
  keys: string;
  action: string;
}

export const SHORTCUTS: Shortcut[] = [
  { keys: 'Ctrl+Z', action: 'Undo' },
  { keys: 'Ctrl+Shift+Z or Ctrl+Y', action: 'Redo' },
  { keys: 'Ctrl+C', action: 'Copy the selection' },
  { keys: 'Ctrl+V', action: 'Paste (shifted a little)' },
  { keys: 'Delete or Backspace', action: 'Delete the selection' },
  { keys: 'Ctrl+S', action: 'Save study (asks for an optional message)' },
  { keys: 'F', action: 'Fit view' },
  { keys: 'G', action: 'Snap to grid on/off' },
  { keys: 'Escape', action: 'Clear the selection' },
  { keys: '?', action: 'This list' },
  { keys: 'Tab', action: 'Move between controls; nodes and connections are reachable by Tab inside the diagram, Enter selects' },
];

export type ShortcutAction = 'undo' | 'redo' | 'copy' | 'paste' | 'delete' | 'save' | 'fit' | 'grid' | 'deselect' | 'help';

/** The action of a key event, or null. Typing in a field never triggers one (except Ctrl+S). */
export function shortcutOf(e: Pick<KeyboardEvent, 'key' | 'ctrlKey' | 'metaKey' | 'shiftKey' | 'altKey'>, inField: boolean): ShortcutAction | null {
  const mod = e.ctrlKey || e.metaKey;
  const k = e.key.toLowerCase();
  if (mod && k === 's') return 'save';
  if (inField) return null;
  if (mod && k === 'z') return e.shiftKey ? 'redo' : 'undo';
  if (mod && k === 'y') return 'redo';
  if (mod && k === 'c') return 'copy';
  if (mod && k === 'v') return 'paste';
  if (mod || e.altKey) return null;
  if (e.key === 'Delete' || e.key === 'Backspace') return 'delete';
  if (e.key === '?') return 'help';
  if (k === 'f') return 'fit';
  if (k === 'g') return 'grid';
  if (e.key === 'Escape') return 'deselect';
  return null;
}
