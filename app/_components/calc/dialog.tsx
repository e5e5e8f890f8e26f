"use client";
/** A modal dialog on the native <dialog> element: focus is trapped, Escape closes it. */
import { useEffect, useRef, type ReactNode } from "react";
import { cx } from "../ui";

export function Dialog({ open, onClose, title, children, className, wide }: { open: boolean; onClose: () => void; title: string; children: ReactNode; className?: string; wide?: boolean }) {
  const ref = useRef<HTMLDialogElement | null>(null);
  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) d.showModal();
    if (!open && d.open) d.close();
  }, [open]);
  return (
    <dialog
      ref={ref}
      aria-label={title}
      onClose={onClose}
      onCancel={(e) => {
        e.preventDefault();
        onClose();
      }}
      className={cx(
        "m-auto rounded-lg border border-rule-strong bg-sheet p-0 text-ink shadow-[0_12px_40px_rgb(0_0_0/0.18)] backdrop:bg-ink/25",
        wide ? "w-[min(960px,calc(100vw-2rem))]" : "w-[min(480px,calc(100vw-2rem))]",
        className,
      )}
    >
      {open ? (
        <>
          <header className="flex items-center justify-between border-b border-rule px-4 py-2.5">
            <h2 className="text-[15px]">{title}</h2>
            <button type="button" onClick={onClose} className="rounded px-1.5 text-[18px] leading-none text-ink-3 hover:text-ink" aria-label="Close">
              ×
            </button>
          </header>
          <div className="p-4">{children}</div>
        </>
      ) : null}
    </dialog>
  );
}
