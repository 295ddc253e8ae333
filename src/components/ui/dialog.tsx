// A modal dialog on the native <dialog> element: focus is trapped and Escape closes it.
import { useEffect, useRef, type ReactNode } from 'react';

export function Dialog({ open, title, onClose, children }: { open: boolean; title: string; onClose: () => void; children: ReactNode }) {
  const ref = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) d.showModal();
    if (!open && d.open) d.close();
  }, [open]);
  return (
    <dialog
      ref={ref}
      onClose={onClose}
      aria-labelledby="dialog-title"
      className="m-auto w-[min(40rem,calc(100vw-2rem))] rounded-lg border border-rule bg-paper-raised p-0 text-ink shadow-xl backdrop:bg-ink/40"
    >
      {open ? (
        <div className="p-5">
          <h2 id="dialog-title" className="mb-3 text-xl font-semibold">
            {title}
          </h2>
          {children}
        </div>
      ) : null}
    </dialog>
  );
}
