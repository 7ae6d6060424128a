import { useEffect, useId, useRef, type ReactNode } from 'react';
import { Button } from './button.tsx';

const FOCUSABLE = 'a[href], button:not([disabled]), input:not([disabled]), select:not([disabled]), textarea:not([disabled]), [tabindex]:not([tabindex="-1"])';

interface DialogProps {
  open: boolean;
  title: ReactNode;
  onClose: () => void;
  children: ReactNode;
  /** Text under the title, read with it by screen readers. */
  description?: ReactNode;
  width?: string;
}

/**
 * A modal dialog: labelled by its title, Escape closes, Tab stays inside, and focus returns to
 * whatever opened it. Written by hand to keep the bundle small and the behaviour explicit.
 */
export function Dialog({ open, title, onClose, children, description, width = 'max-w-md' }: DialogProps) {
  const titleId = useId();
  const descId = useId();
  const panel = useRef<HTMLDivElement>(null);
  const onCloseRef = useRef(onClose);
  onCloseRef.current = onClose;

  useEffect(() => {
    if (!open) return;
    const opener = document.activeElement as HTMLElement | null;
    const el = panel.current;
    const first = el?.querySelector<HTMLElement>('[data-autofocus]') ?? el?.querySelector<HTMLElement>(FOCUSABLE);
    (first ?? el)?.focus();
    function onKey(e: KeyboardEvent) {
      if (e.key === 'Escape') {
        e.stopPropagation();
        onCloseRef.current();
        return;
      }
      if (e.key !== 'Tab' || !el) return;
      const items = Array.from(el.querySelectorAll<HTMLElement>(FOCUSABLE));
      if (items.length === 0) return;
      const firstItem = items[0];
      const lastItem = items[items.length - 1];
      if (e.shiftKey && document.activeElement === firstItem) {
        e.preventDefault();
        lastItem.focus();
      } else if (!e.shiftKey && document.activeElement === lastItem) {
        e.preventDefault();
        firstItem.focus();
      }
    }
    document.addEventListener('keydown', onKey);
    return () => {
      document.removeEventListener('keydown', onKey);
      opener?.focus?.();
    };
  }, [open]);

  if (!open) return null;
  return (
    <div className="fixed inset-0 z-50 flex items-start justify-center bg-console/40 px-4 pt-[12vh]" onMouseDown={(e) => e.target === e.currentTarget && onClose()}>
      <div
        ref={panel}
        role="dialog"
        aria-modal="true"
        aria-labelledby={titleId}
        aria-describedby={description ? descId : undefined}
        tabIndex={-1}
        className={`w-full ${width} rounded-[4px] border border-rule-strong bg-panel shadow-[0_8px_30px_rgba(20,30,35,0.25)]`}
      >
        <div className="border-b border-rule px-4 py-2.5">
          <h2 id={titleId} className="text-base">
            {title}
          </h2>
          {description ? (
            <p id={descId} className="mt-0.5 text-[13px] text-ink-muted">
              {description}
            </p>
          ) : null}
        </div>
        <div className="px-4 py-3">{children}</div>
      </div>
    </div>
  );
}

interface ConfirmDialogProps {
  open: boolean;
  title: ReactNode;
  children: ReactNode;
  confirmLabel: string;
  onConfirm: () => void;
  onCancel: () => void;
  busy?: boolean;
  error?: string;
}

/** Asks before something that cannot be undone from the UI (delete, remove a member). */
export function ConfirmDialog({ open, title, children, confirmLabel, onConfirm, onCancel, busy, error }: ConfirmDialogProps) {
  return (
    <Dialog open={open} title={title} onClose={onCancel}>
      <div className="text-sm">{children}</div>
      {error ? (
        <p role="alert" className="mt-2 text-[13px] text-danger">
          <span aria-hidden="true">✕ </span>
          {error}
        </p>
      ) : null}
      <div className="mt-4 flex justify-end gap-2">
        <Button onClick={onCancel} data-autofocus>
          Cancel
        </Button>
        <Button variant="danger" onClick={onConfirm} busy={busy} busyText="Working…">
          {confirmLabel}
        </Button>
      </div>
    </Dialog>
  );
}
