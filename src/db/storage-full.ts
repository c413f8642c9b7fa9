/**
 * Announcements of "no room left" failures to whatever shows them (the app's storage alert): every
 * quota error that `storageErrorMap` turns into a StorageFullError on this thread is reported here,
 * so a screen that only shows a status line still gets the failure announced. Workers have their own
 * listeners (none); their screens show the error they pass back.
 */
export type StorageFullListener = (error: Error) => void;

const listeners = new Set<StorageFullListener>();

/** Listen for quota failures; returns the function that stops listening. */
export function storageFullListen(listener: StorageFullListener): () => void {
  listeners.add(listener);
  return () => void listeners.delete(listener);
}

export function storageFullAnnounce(error: Error): void {
  for (const listener of [...listeners]) {
    try {
      listener(error);
    } catch {
      // A broken listener must not turn a clear storage error into another one.
    }
  }
}
