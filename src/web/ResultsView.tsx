/** The right-hand side of the page: a contents line, the report download, the "go to cell" box and every sheet. */
import type { ReactNode } from 'react';
import { useState, useSyncExternalStore } from 'react';
import { INVENTED_DATA_NOTE } from '../core/report/cautions';
import { isDemoSource } from './demoData';
import { downloadReport, downloadReportFile, reportFileName } from './download';
import type { ResultStore } from './resultStore';
import { sheetDomId } from './resultStore';
import { SheetView } from './SheetView';
import { SourceRowView } from './SourceRowView';

export function ResultsView({ store }: { readonly store: ResultStore }): ReactNode {
  const state = useSyncExternalStore(store.subscribe, store.get);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const onDownload = async (): Promise<void> => {
    setBusy(true);
    setError(null);
    try {
      // The workbook is written in the engine worker (state.report), so the page keeps answering meanwhile.
      if (state.report !== null) downloadReportFile(await state.report(), reportFileName(new Date()));
      else await downloadReport(state.sheets.map((s) => ({ ...s.spec, name: s.name })), reportFileName(new Date()), state.stamp);
    } catch (e) {
      setError(`The report could not be built: ${e instanceof Error ? e.message : String(e)}`);
    } finally {
      setBusy(false);
    }
  };
  return (
    <div className="results">
      <header className="results-head">
        <h1>Results</h1>
        {state.sheets.length > 0 && (
          <button type="button" className="primary-button" onClick={() => void onDownload()} disabled={busy}>
            {busy ? 'Preparing the report…' : 'Download report (.xlsx)'}
          </button>
        )}
      </header>
      {isDemoSource(state.source) && <p className="small">{INVENTED_DATA_NOTE}</p>}
      {error !== null && (
        <p className="error" role="alert">
          {error}
        </p>
      )}
      {state.notice !== null && (
        <p className="notice" role="status">
          {state.notice}
        </p>
      )}
      {state.source !== null && state.highlight !== null && (
        <SourceRowView
          source={state.source}
          highlight={state.highlight}
          shownHeaders={state.shownHeaders}
          onClose={() => store.update({ highlight: null })}
        />
      )}
      {state.sheets.length === 0 ? (
        <div className="empty">
          <p>
            Choose a data file and a schedule in the pane on the left, then run the analysis. The result sheets appear
            here.
          </p>
          <p>Everything runs inside this page: no file leaves your computer.</p>
        </div>
      ) : (
        <>
          <nav aria-label="Result sheets" className="sheet-nav">
            {state.sheets.map((s) => (
              <a key={s.name} href={`#${sheetDomId(s.name)}`}>
                {s.spec.title}
              </a>
            ))}
          </nav>
          {state.sheets.map((s) => (
            <SheetView key={s.name} name={s.name} spec={s.spec} {...(s.tableRows !== undefined ? { tableRows: s.tableRows } : {})} />
          ))}
        </>
      )}
    </div>
  );
}
