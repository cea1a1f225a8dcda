import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './ui/App.tsx';
import { startController } from './state/service.ts';
import { startStandardsRunner } from './ui/calibration/standards-runner.ts';
import { ErrorBoundary } from './ui/ErrorBoundary.tsx';
import { registerOfflineCopy } from './ui/offline.ts';
import { startUp } from './ui/startup.ts';
import './ui/styles.css';

startController();
startStandardsRunner();
createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <ErrorBoundary area="the page" drawsSession actions={<button type="button" onClick={() => window.location.reload()}>Reload and choose whether to restore this session</button>}>
      <App />
    </ErrorBoundary>
  </StrictMode>,
);
// A session kept from the last visit comes back (after asking, when it failed to draw last time); otherwise the demo opens.
void startUp();
registerOfflineCopy();
