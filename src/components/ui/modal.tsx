import { useEffect, useId, useRef, type ReactNode } from 'react';
import { Button } from '@/components/ui/button';

/**
 * A modal on the native <dialog> element: focus moves into it and is trapped by the browser,
 * Escape closes it, and the page behind is inert while it is open.
 */
export function Modal({ open, onClose, title, children }: { open: boolean; onClose: () => void; title: string; children: ReactNode }) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) {
      if (typeof d.showModal === 'function') d.showModal();
      else d.setAttribute('open', '');
    }
    if (!open && d.open) {
      if (typeof d.close === 'function') d.close();
      else d.removeAttribute('open');
    }
  }, [open]);
  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onClose={onClose}
      onCancel={(e) => {
        e.preventDefault();
        onClose();
      }}
      className="m-auto w-[calc(100%-2rem)] max-w-lg rounded-lg border border-ink-100 bg-white p-0 shadow-xl backdrop:bg-ink-900/40"
    >
      {open && (
        <div>
          <header className="flex items-center justify-between border-b border-ink-100 px-4 py-3">
            <h2 id={titleId} className="text-base font-semibold text-ink-900">
              {title}
            </h2>
            <Button variant="ghost" size="sm" onClick={onClose} aria-label="Close">
              ✕
            </Button>
          </header>
          <div className="px-4 py-4">{children}</div>
        </div>
      )}
    </dialog>
  );
}
