/** The browser page: the task pane at 350 px on the left, the results on the right. */
import type { ReactNode } from 'react';
import { App } from '../taskpane/App';
import { ResultsView } from './ResultsView';
import type { WebActions } from './webActions';

export function Page({ actions }: { readonly actions: WebActions }): ReactNode {
  return (
    <div className="page">
      <div className="pane" aria-label="Analysis steps">
        {actions.engine !== undefined ? <App actions={actions} engine={actions.engine} /> : <App actions={actions} />}
      </div>
      <div className="results-area">
        <ResultsView store={actions.store} />
      </div>
    </div>
  );
}
