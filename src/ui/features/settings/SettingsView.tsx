import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useState } from 'react';
import { backupMake, projectGet, storageStatus, type StorageStatus } from '../../../db';
import { useNav } from '../../../state/nav';
import { appDb } from '../../app/db';
import type { ProjectViewProps } from '../../app/project-views';
import { RestoreBackup } from './RestoreBackup';
import { storagePersistText, storageUsageText } from './settings-text';
import './settings.css';

function StorageSection() {
  const [status, setStatus] = useState<StorageStatus | null>(null);
  const [asked, setAsked] = useState<string | null>(null);
  useEffect(() => {
    let live = true;
    void storageStatus().then((s) => live && setStatus(s));
    return () => {
      live = false;
    };
  }, []);

  async function keep() {
    const next = await storageStatus({ requestPersist: true });
    setStatus(next);
    setAsked(next.persisted === true ? 'The browser agreed to keep this data.' : 'The browser did not agree (it may decide later, for example once you use the app more often).');
  }

  return (
    <section aria-labelledby="storage-title">
      <h3 id="storage-title">Storage on this computer</h3>
      {status === null ? (
        <p>Checking…</p>
      ) : (
        <>
          <p>{storageUsageText(status)}</p>
          <p>{storagePersistText(status.persisted)}</p>
          {status.persisted !== true && (
            <button type="button" onClick={() => void keep()}>
              Keep my data when the browser clears space
            </button>
          )}
          {asked !== null && <p role="status">{asked}</p>}
        </>
      )}
    </section>
  );
}

function LabelsSection({ projectId }: ProjectViewProps) {
  const project = useLiveQuery(() => projectGet(appDb(), projectId), [projectId]);
  if (project === undefined) return null;
  const { slots, intents } = project.schema;
  return (
    <section aria-labelledby="labels-title">
      <h3 id="labels-title">Labels</h3>
      <p>
        Tag scheme shown: <code>{project.scheme.toUpperCase()}</code>. Editing labels comes later; this is the list as it stands.
      </p>
      <h4>Slots ({slots.length})</h4>
      {slots.length === 0 ? (
        <p className="muted">No slots defined yet.</p>
      ) : (
        <ul aria-label="Slots">
          {slots.map((s) => (
            <li key={s.name}>
              <code>{s.name}</code>
              {s.description === undefined ? '' : ` — ${s.description}`}
            </li>
          ))}
        </ul>
      )}
      <h4>Intents ({intents.length})</h4>
      {intents.length === 0 ? (
        <p className="muted">No intents defined yet.</p>
      ) : (
        <ul aria-label="Intents">
          {intents.map((i) => (
            <li key={i.name}>
              <code>{i.name}</code>
              {i.description === undefined ? '' : ` — ${i.description}`}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

function BackupSection({ projectId }: ProjectViewProps) {
  const [message, setMessage] = useState<{ error: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  async function save() {
    setBusy(true);
    setMessage(null);
    try {
      const file = await backupMake(appDb(), projectId);
      const url = URL.createObjectURL(new Blob(file.parts, { type: 'application/x-ndjson;charset=utf-8' }));
      const link = document.createElement('a');
      link.href = url;
      link.download = file.fileName;
      document.body.append(link);
      link.click();
      link.remove();
      // The download has taken its copy once click() returns; a minute's grace for slow browsers.
      setTimeout(() => URL.revokeObjectURL(url), 60_000);
      const left = file.warnings.length === 0 ? '' : ` Left out: ${file.warnings.join(' ')}`;
      setMessage({ error: false, text: `Saved ${file.fileName} to your downloads.${left}` });
    } catch (error) {
      setMessage({ error: true, text: `The backup could not be made: ${(error as Error).message}` });
    } finally {
      setBusy(false);
    }
  }

  return (
    <section aria-labelledby="backup-title">
      <h3 id="backup-title">Backup</h3>
      <p>One file with the labels, utterances, annotators and edit history of this project, and its saved model, team-work packs and dismissed findings.</p>
      <button type="button" onClick={() => void save()} disabled={busy}>
        Save a backup of this project
      </button>
      {message !== null && (
        <p role={message.error ? 'alert' : 'status'} className={message.error ? 'error' : undefined}>
          {message.text}
        </p>
      )}
    </section>
  );
}

/** "Project settings": storage, labels, backup and restore. */
export function SettingsView({ projectId }: ProjectViewProps) {
  const project = useLiveQuery(() => projectGet(appDb(), projectId), [projectId]);
  const go = useNav((s) => s.go);
  return (
    <section aria-labelledby="settings-title" className="settings">
      <h2 id="settings-title">Project settings{project === undefined ? '' : `: ${project.name}`}</h2>
      <StorageSection />
      <LabelsSection projectId={projectId} />
      <BackupSection projectId={projectId} />
      <section aria-labelledby="restore-title">
        <h3 id="restore-title">Restore</h3>
        <RestoreBackup onOpen={(id) => go('settings', id)} />
      </section>
    </section>
  );
}
