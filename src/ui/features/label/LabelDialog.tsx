import { useEffect, useRef, type KeyboardEvent, type ReactNode } from 'react';

const FOCUSABLE = 'button:not([disabled]), [href], input:not([disabled]), select:not([disabled]), textarea:not([disabled]), [tabindex]:not([tabindex="-1"])';

interface LabelDialogProps {
  open: boolean;
  titleId: string;
  /** Escape closes it; false for prompts that need an answer. */
  dismissable?: boolean;
  onClose: () => void;
  className?: string;
  children: ReactNode;
}

/**
 * A modal panel on the browser's own <dialog> (showModal makes the page behind it inert). Tab and
 * Shift+Tab also cycle inside it, so focus never wanders to the page or the browser's address bar;
 * closing gives focus back to where it was.
 */
export function LabelDialog({ open, titleId, dismissable = true, onClose, className, children }: LabelDialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const before = useRef<Element | null>(null);

  useEffect(() => {
    const dialog = ref.current;
    if (dialog === null) return;
    if (open && !dialog.open) {
      before.current = document.activeElement;
      dialog.showModal();
      dialog.querySelector<HTMLElement>('[data-autofocus]')?.focus();
    } else if (!open && dialog.open) {
      dialog.close();
      if (before.current instanceof HTMLElement) before.current.focus();
    }
  }, [open]);

  function trap(event: KeyboardEvent<HTMLDialogElement>) {
    event.stopPropagation();
    if (event.key !== 'Tab' || ref.current === null) return;
    const items = [...ref.current.querySelectorAll<HTMLElement>(FOCUSABLE)];
    const first = items[0];
    const last = items[items.length - 1];
    if (first === undefined || last === undefined) return;
    if (event.shiftKey && document.activeElement === first) {
      event.preventDefault();
      last.focus();
    } else if (!event.shiftKey && document.activeElement === last) {
      event.preventDefault();
      first.focus();
    }
  }

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      className={className === undefined ? 'label-dialog' : `label-dialog ${className}`}
      onKeyDown={trap}
      onCancel={(event) => {
        // Escape: the browser would close the dialog itself; the screen's state decides instead.
        event.preventDefault();
        if (dismissable) onClose();
      }}
    >
      {open && children}
    </dialog>
  );
}
