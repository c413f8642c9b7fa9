export interface DownloadLink {
  name: string;
  url: string;
  count: number;
  bytes: number;
}

function sizeText(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KiB`;
  return `${(bytes / 1024 / 1024).toFixed(1)} MiB`;
}

/** The written files, each a plain link to its Blob; nothing leaves the machine. */
export function ExportDownloads({ links, report }: { links: readonly DownloadLink[]; report: string }) {
  return (
    <section aria-labelledby="downloads-title">
      <h3 id="downloads-title">Files ready</h3>
      <p>{report}</p>
      <ul className="downloads" aria-label="Files to save">
        {links.map((l) => (
          <li key={l.name}>
            <a href={l.url} download={l.name}>
              Save {l.name}
            </a>{' '}
            <span className="muted">
              ({l.count} utterance{l.count === 1 ? '' : 's'}, {sizeText(l.bytes)})
            </span>
          </li>
        ))}
      </ul>
    </section>
  );
}
