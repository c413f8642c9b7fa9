import { useEffect, useState } from 'react';
import { storageFullListen } from '../../db/storage-full';
import './storage-full-alert.css';

/**
 * The app-wide "no room left" alert: any save on this page that fails for lack of storage is
 * announced here at once (role="alert": assertive, and it never takes the focus, so typing goes on).
 * Screens may show the failure in their own words too; this one says what to do next.
 */
export function StorageFullAlert() {
  const [failure, setFailure] = useState<{ message: string; count: number } | null>(null);
  useEffect(() => storageFullListen((error) => setFailure((now) => ({ message: error.message, count: (now?.count ?? 0) + 1 }))), []);
  if (failure === null) return null;
  return (
    <div role="alert" className="storage-full-alert">
      <p>
        <strong>Storage is full: a save failed.</strong>
        {failure.count > 1 && ` (${failure.count} saves failed.)`}
      </p>
      <p>{failure.message}</p>
      <button type="button" onClick={() => setFailure(null)}>
        Dismiss
      </button>
    </div>
  );
}
