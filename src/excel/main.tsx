/** Entry of the Excel task pane: waits for the Office platform, then mounts the pane with the Excel host actions. */
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from '../taskpane/App';
import { createExcelActions } from './actions';

void Office.onReady(() => {
  const root = document.getElementById('root');
  if (root === null) throw new Error('The task pane page has no element with id "root".');
  createRoot(root).render(
    <StrictMode>
      <App actions={createExcelActions()} />
    </StrictMode>,
  );
});
