/**
 * An edit held for its solver's answer (see `solveAhead` in solve/use-live-solve.ts) must reach the
 * document before anything the user does next can see the document without it. This hook commits it
 * (`flush`, which returns true when there was one) on:
 * - the next key or pointer press in the page (a link followed, another field, a drag);
 * - the window losing focus (a click on the browser's own controls, such as Back, or another window);
 * - history navigation (`popstate`, captured before the router's own listener, and committed
 *   synchronously so the unsaved-changes guard sees the edit);
 * - the page being closed or reloaded: the edit is committed and the browser asked to warn, since it
 *   cannot yet have been saved.
 */
import { useEffect, type RefObject } from 'react';
import { flushSync } from 'react-dom';

export function useCommitHeld(flush: RefObject<() => boolean>) {
  useEffect(() => {
    const commit = () => {
      flush.current();
    };
    const commitNow = () => {
      flushSync(() => {
        flush.current();
      });
    };
    const onUnload = (e: BeforeUnloadEvent) => {
      if (!flush.current()) return;
      e.preventDefault();
      e.returnValue = '';
    };
    document.addEventListener('pointerdown', commit, true);
    document.addEventListener('keydown', commit, true);
    window.addEventListener('blur', commitNow);
    window.addEventListener('popstate', commitNow, true);
    window.addEventListener('beforeunload', onUnload, true);
    return () => {
      document.removeEventListener('pointerdown', commit, true);
      document.removeEventListener('keydown', commit, true);
      window.removeEventListener('blur', commitNow);
      window.removeEventListener('popstate', commitNow, true);
      window.removeEventListener('beforeunload', onUnload, true);
    };
  }, [flush]);
}
