import { describe, expect, it } from 'vitest';
import { shortcutOf } from '../../../../../src/features/workspace/editing/shortcuts.ts';

const key = (k: string, mods: Partial<{ ctrlKey: boolean; metaKey: boolean; shiftKey: boolean; altKey: boolean }> = {}) => ({ key: k, ctrlKey: false, metaKey: false, shiftKey: false, altKey: false, ...mods });

describe('shortcutOf', () => {
  it('maps the listed keys to their actions', () => {
    expect(shortcutOf(key('z', { ctrlKey: true }), false)).toBe('undo');
    expect(shortcutOf(key('Z', { ctrlKey: true, shiftKey: true }), false)).toBe('redo');
    expect(shortcutOf(key('y', { metaKey: true }), false)).toBe('redo');
    expect(shortcutOf(key('c', { ctrlKey: true }), false)).toBe('copy');
    expect(shortcutOf(key('v', { ctrlKey: true }), false)).toBe('paste');
    expect(shortcutOf(key('Delete'), false)).toBe('delete');
    expect(shortcutOf(key('Backspace'), false)).toBe('delete');
    expect(shortcutOf(key('?', { shiftKey: true }), false)).toBe('help');
    expect(shortcutOf(key('f'), false)).toBe('fit');
    expect(shortcutOf(key('g'), false)).toBe('grid');
    expect(shortcutOf(key('Escape'), false)).toBe('deselect');
    expect(shortcutOf(key('s', { ctrlKey: true }), false)).toBe('save');
  });

  it('leaves typing in a field alone, except Ctrl+S', () => {
    expect(shortcutOf(key('Backspace'), true)).toBeNull();
    expect(shortcutOf(key('z', { ctrlKey: true }), true)).toBeNull();
    expect(shortcutOf(key('f'), true)).toBeNull();
    expect(shortcutOf(key('s', { ctrlKey: true }), true)).toBe('save');
    expect(shortcutOf(key('f', { altKey: true }), false)).toBeNull();
  });
});
