import { act, render } from '@testing-library/react';
import { useRef, useState } from 'react';
import { afterEach, describe, expect, it } from 'vitest';
import { useCommitHeld } from '../../../../../src/features/workspace/editing/use-commit-held.ts';

/** A page with one edit held (like one waiting for its solver's answer): `flush` commits it into state. */
let holding = true;
function Page() {
  const [value, setValue] = useState('3 kW');
  const flush = useRef(() => {
    if (!holding) return false;
    holding = false;
    setValue('5 kW');
    return true;
  });
  useCommitHeld(flush);
  return <output>{value}</output>;
}
const shown = () => document.querySelector('output')!.textContent;

describe('useCommitHeld: an edit held for its answer reaches the document before the user moves on', () => {
  afterEach(() => {
    holding = true;
  });

  it('history navigation (Back) commits it and renders it before the event returns, so the unsaved-changes guard sees it', () => {
    render(<Page />);
    window.dispatchEvent(new PopStateEvent('popstate'));
    expect(shown()).toBe('5 kW'); // no act(): rendered synchronously, before the router's own listener runs
  });

  it('the window losing focus (a click on the browser’s own controls) commits it at once', () => {
    render(<Page />);
    window.dispatchEvent(new Event('blur'));
    expect(shown()).toBe('5 kW');
  });

  it('closing or reloading the page with an edit held asks the browser to warn; with none it does not', () => {
    render(<Page />);
    const first = new Event('beforeunload', { cancelable: true });
    window.dispatchEvent(first);
    expect(first.defaultPrevented).toBe(true);
    const second = new Event('beforeunload', { cancelable: true });
    window.dispatchEvent(second);
    expect(second.defaultPrevented).toBe(false);
  });

  it('the next key or pointer press commits it; a page that is gone listens no more', () => {
    const page = render(<Page />);
    act(() => {
      document.body.dispatchEvent(new KeyboardEvent('keydown', { key: 'Tab', bubbles: true }));
    });
    expect(shown()).toBe('5 kW');
    holding = true;
    act(() => {
      document.body.dispatchEvent(new Event('pointerdown', { bubbles: true }));
    });
    expect(holding).toBe(false);
    page.unmount();
    holding = true;
    document.body.dispatchEvent(new Event('pointerdown', { bubbles: true }));
    window.dispatchEvent(new PopStateEvent('popstate'));
    expect(holding).toBe(true);
  });
});
