import { PRODUCT_NAME } from '../core/version';

/** The app shell; screens arrive with later issues and mount inside <main>. */
export function App() {
  return (
    <div className="shell">
      <header className="shell-header">
        <h1>
          {PRODUCT_NAME} <span className="shell-version">v{__APP_VERSION__}</span>
        </h1>
        <p className="shell-tagline">Slot and intent labelling for chat utterances, kept on this machine.</p>
      </header>
      <main className="shell-main">
        <p>
          Your data stays in this browser: nothing is uploaded. Import, labelling, agreement and export screens
          arrive here as they are built; the command line (<code>npm run cli -- check FILE</code>) already checks and
          converts IOB2, BIOES and JSON Lines files.
        </p>
      </main>
    </div>
  );
}
