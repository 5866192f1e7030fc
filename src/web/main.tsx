/** Entry of the browser page: mounts the page with the file-based host actions, its engine in a worker. */
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { Page } from './Page';
import { createWebActions } from './webActions';
import { WorkerEngine } from './workerEngine';
import { ResultStore } from './resultStore';

const engine = new WorkerEngine();
engine.warmUp();
const root = document.getElementById('root');
if (root === null) throw new Error('The page has no element with id "root".');
createRoot(root).render(
  <StrictMode>
    <Page actions={createWebActions(new ResultStore(), engine)} />
  </StrictMode>,
);
