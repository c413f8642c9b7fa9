import { RESOLVE_KEYS } from './resolve-keys';

/** The keys of this screen, from the same table the key handler uses. */
export function KeyList() {
  return (
    <section aria-labelledby="resolve-keys-title" className="resolve-keys">
      <h3 id="resolve-keys-title">Keys</h3>
      <dl>
        {RESOLVE_KEYS.map((row) => (
          <div key={row.keys}>
            <dt>
              <kbd>{row.keys}</kbd>
            </dt>
            <dd>{row.what}</dd>
          </div>
        ))}
      </dl>
    </section>
  );
}
