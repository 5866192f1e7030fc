/**
 * Entry of the Excel task pane: waits for the Office platform, checks that the host is Excel and the Excel API level the adapter needs
 * (ExcelApi 1.7: range by indexes, chart series, frozen panes; the manifest asks for it too), then mounts the pane
 * with the Excel host actions. On an older Excel it says so instead of failing later. Features newer than 1.7 are
 * checked where they are used (src/excel/features.ts).
 */
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from '../taskpane/App';
import { createExcelActions } from './actions';
import { MINIMUM_EXCEL_API, supportsExcelApi } from './features';

void Office.onReady((info) => {
  const root = document.getElementById('root');
  if (root === null) throw new Error('The task pane page has no element with id "root".');
  if (info.host !== Office.HostType.Excel) {
    root.textContent =
      'This is the Longipane pane for Excel: open it from the Longipane button on Excel\'s Home tab. ' +
      'To use Longipane without Excel, open index.html, the browser page, instead.';
    return;
  }
  if (!supportsExcelApi(MINIMUM_EXCEL_API)) {
    root.textContent = 'Longipane needs a newer version of Excel (one that supports the Excel JavaScript API 1.7 or later).';
    return;
  }
  createRoot(root).render(
    <StrictMode>
      <App actions={createExcelActions()} />
    </StrictMode>,
  );
});
