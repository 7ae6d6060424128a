/** The workspace shortcuts hook: each key calls its handler; typing in a field and read-only views are respected. */
import { fireEvent, render } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import type { ShortcutAction } from '../../../../../src/features/workspace/editing/shortcuts.ts';
import { useShortcuts } from '../../../../../src/features/workspace/editing/use-shortcuts.ts';

const ACTIONS: ShortcutAction[] = ['undo', 'redo', 'copy', 'paste', 'delete', 'save', 'fit', 'grid', 'deselect', 'help'];

function Harness({ readOnly, handlers }: { readOnly: boolean; handlers: Record<ShortcutAction, () => void> }) {
  useShortcuts(readOnly, handlers);
  return <input aria-label="field" />;
}

function handlers() {
  return Object.fromEntries(ACTIONS.map((a) => [a, vi.fn<() => void>()])) as Record<ShortcutAction, ReturnType<typeof vi.fn<() => void>>>;
}

describe('useShortcuts', () => {
  it('calls the handler of each key', () => {
    const h = handlers();
    render(<Harness readOnly={false} handlers={h} />);
    fireEvent.keyDown(window, { key: 'z', ctrlKey: true });
    fireEvent.keyDown(window, { key: 'v', ctrlKey: true });
    fireEvent.keyDown(window, { key: 'Delete' });
    fireEvent.keyDown(window, { key: 'f' });
    expect(h.undo).toHaveBeenCalledTimes(1);
    expect(h.paste).toHaveBeenCalledTimes(1);
    expect(h.delete).toHaveBeenCalledTimes(1);
    expect(h.fit).toHaveBeenCalledTimes(1);
  });

  it('ignores edits when read-only, and everything but save while typing in a field', () => {
    const h = handlers();
    const { unmount } = render(<Harness readOnly handlers={h} />);
    fireEvent.keyDown(window, { key: 'z', ctrlKey: true });
    fireEvent.keyDown(window, { key: 'Delete' });
    fireEvent.keyDown(window, { key: 'f' });
    expect(h.undo).not.toHaveBeenCalled();
    expect(h.delete).not.toHaveBeenCalled();
    expect(h.fit).toHaveBeenCalledTimes(1);
    unmount();
    const e = handlers();
    const r = render(<Harness readOnly={false} handlers={e} />);
    fireEvent.keyDown(r.getByLabelText('field'), { key: 'Delete' });
    fireEvent.keyDown(r.getByLabelText('field'), { key: 's', ctrlKey: true });
    expect(e.delete).not.toHaveBeenCalled();
    expect(e.save).toHaveBeenCalledTimes(1);
  });
});
