import { useState, type ReactNode } from 'react';

/** A folded section whose content is built only once opened: the charts' tables cost nothing until asked for. */
export function LazyDetails({ summary, className, children }: { summary: string; className: string; children: () => ReactNode }) {
  const [open, setOpen] = useState(false);
  return (
    <details className={className} onToggle={(e) => setOpen(e.currentTarget.open)}>
      <summary>{summary}</summary>
      {open && children()}
    </details>
  );
}
