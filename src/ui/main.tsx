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
