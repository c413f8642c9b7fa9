import { useCallback, useEffect, useRef, useState } from 'react';

export interface Download {
  name: string;
  url: string;
  detail: string;
}

/** Blob links for files made in the page; older links are revoked when replaced or on leaving. */
export function useDownloads(): [Download[], (files: { name: string; text: string; detail: string }[]) => void] {
  const [links, setLinks] = useState<Download[]>([]);
  const current = useRef<Download[]>([]);
  const set = useCallback((files: { name: string; text: string; detail: string }[]) => {
    for (const l of current.current) URL.revokeObjectURL(l.url);
    const next = files.map((f) => ({ name: f.name, detail: f.detail, url: URL.createObjectURL(new Blob([f.text], { type: 'application/x-ndjson' })) }));
    current.current = next;
    setLinks(next);
  }, []);
  useEffect(() => () => current.current.forEach((l) => URL.revokeObjectURL(l.url)), []);
  return [links, set];
}
