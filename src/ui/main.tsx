import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './app/App';
import './app.css';

const container = document.getElementById('root');
if (container === null) throw new Error('index.html lacks the #root element');
createRoot(container).render(
  <StrictMode>
    <App />
  </StrictMode>,
);

// Offline use after the first load (public/sw.js); the dev server has no built file list to cache.
if (import.meta.env.PROD && 'serviceWorker' in navigator) {
  window.addEventListener('load', () => {
    navigator.serviceWorker.register('/sw.js').catch((error: unknown) => console.warn('offline use unavailable: the service worker did not register', error));
  });
}
