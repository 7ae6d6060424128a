/**
 * The browser tab's title for a page ("Phase balancing — Lane 14 — Wyeward"): people with many tabs,
 * screen readers announcing the page, and the browser's print-to-PDF file name and page header all
 * read it. Parts that are not known yet (a study still loading) are left out.
 */
import { useEffect } from 'react';

export const APP_TITLE = 'Wyeward';

/** The title made of the page's parts, most specific first, then the app's name. */
export function documentTitle(...parts: (string | null | undefined | false)[]): string {
  return [...parts.filter((p): p is string => typeof p === 'string' && p.trim() !== ''), APP_TITLE].join(' — ');
}

/** Sets the document title while the page is shown; the app's name comes back when it goes. */
export function useDocumentTitle(...parts: (string | null | undefined | false)[]): void {
  const title = documentTitle(...parts);
  useEffect(() => {
    document.title = title;
    return () => {
      document.title = APP_TITLE;
    };
  }, [title]);
}
