import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './ui/App.tsx';
import { loadDemo, startController } from './ui/controller.ts';
import { restoreSession, startSessionAutosave } from './ui/export/session-db.ts';
import { useApp } from './state/store.ts';
import './ui/styles.css';

startController();
createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
// A session kept from the last visit comes back; otherwise the demo opens. Autosave starts after either.
void restoreSession(useApp)
  .catch(() => false)
  .then(async (restored) => {
    // Autosave first, so a file dropped while the demo is still loading is kept too.
    startSessionAutosave(useApp);
    if (!restored) await loadDemo();
  });
