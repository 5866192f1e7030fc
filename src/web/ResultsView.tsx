/**
 * The right-hand side of the page: a contents line, the report download, the "go to cell" box and every sheet.
 *
 * The sheets are drawn one per task: the first with the results, each next one in a task of its own after the last
 * was put on the page, so no single task draws them all (at 300,000 rows the whole results view at once was the
 * page's longest task). Every sheet's section and title are there from the start (so its link in the contents line
 * works); its blocks follow in turn. The view tells the store how far it is (ResultStore.sheetsDrawn), and a run waits
 * for the last sheet before it says it has finished. Sheets are drawn again only when they change (not when the
 * download button or the "go to cell" box changes).
 */
import type { ReactNode } from 'react';
import { memo, useEffect, useState, useSyncExternalStore } from 'react';
import { INVENTED_DATA_NOTE } from '../core/report/cautions';
import { isDemoSource } from './demoData';
import { downloadReport, downloadReportFile, reportFileName } from './download';
import type { PageState, ResultStore } from './resultStore';
import { sheetDomId } from './resultStore';
import { SheetView } from './SheetView';
import { SourceRowView } from './SourceRowView';

/** The sheets, drawn one per task (see the file comment); drawn again only when the sheets change. */
const SheetList = memo(function SheetList({ store, sheets }: { readonly store: ResultStore; readonly sheets: PageState['sheets'] }): ReactNode {
  // How many sheets have their blocks drawn, for which sheets (a new run starts again from its first sheet).
  const [drawn, setDrawn] = useState({ sheets, count: Math.min(1, sheets.length) });
  const count = drawn.sheets === sheets ? drawn.count : Math.min(1, sheets.length);
  if (drawn.sheets !== sheets) setDrawn({ sheets, count });
  useEffect(() => {
    store.sheetsDrawn(sheets, count);
    if (count >= sheets.length) return;
    const next = setTimeout(() => setDrawn((d) => (d.sheets === sheets ? { sheets, count: d.count + 1 } : d)), 0);
    return () => clearTimeout(next);
  }, [store, sheets, count]);
  return (
    <>
      <nav aria-label="Result sheets" className="sheet-nav">
        {sheets.map((s) => (
          <a key={s.name} href={`#${sheetDomId(s.name)}`}>
            {s.spec.title}
          </a>
        ))}
      </nav>
      {sheets.map((s, i) => (
        <SheetView
          key={s.name}
          name={s.name}
          spec={s.spec}
          {...(s.tableRows !== undefined ? { tableRows: s.tableRows } : {})}
          {...(i >= count ? { titleOnly: true } : {})}
        />
      ))}
    </>
  );
});

export function ResultsView({ store }: { readonly store: ResultStore }): ReactNode {
  const state = useSyncExternalStore(store.subscribe, store.get);
  useEffect(() => store.addDrawer(), [store]);
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
        <SheetList store={store} sheets={state.sheets} />
      )}
    </div>
  );
}
