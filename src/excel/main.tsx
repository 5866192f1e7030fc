/**
 * Entry of the Excel task pane: waits for the Office platform, checks that the host is Excel and the Excel API level the adapter needs
 * (ExcelApi 1.7: range by indexes, chart series, frozen panes; the manifest asks for it too), then mounts the pane
 * with the Excel host actions. On an older Excel it says so instead of failing later. Features newer than 1.7 are
 * checked where they are used (src/excel/features.ts).
 *
 * Outside Excel the page is never blank: when the Office script is missing (it could not load), when the platform
 * reports no host or another application, or when no host has answered after OFFICE_WAIT_MS, it shows a plain
 * message (OutsideExcel.tsx). A host that answers later still gets the pane.
 */
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from '../taskpane/App';
import { createExcelActions } from './actions';
import { MINIMUM_EXCEL_API, supportsExcelApi } from './features';
import { OutsideExcel } from './OutsideExcel';

/** How long the page waits for an Office host before saying it runs inside Excel (a host answering later wins). */
export const OFFICE_WAIT_MS = 3000;

const element = document.getElementById('root');
if (element === null) throw new Error('The task pane page has no element with id "root".');
const root = createRoot(element);
let started = false;

function showOutside(otherHost: string | null): void {
  root.render(<OutsideExcel otherHost={otherHost} />);
}

/** Shows what belongs to the host Office reported: the pane in a recent Excel, a message otherwise. */
function start(host: Office.HostType | null): void {
  started = true;
  if (host === null) {
    showOutside(null);
  } else if (host !== Office.HostType.Excel) {
    showOutside(String(host));
  } else if (!supportsExcelApi(MINIMUM_EXCEL_API)) {
    root.render('Longipane needs a newer version of Excel (one that supports the Excel JavaScript API 1.7 or later).');
  } else {
    root.render(
      <StrictMode>
        <App actions={createExcelActions()} />
      </StrictMode>,
    );
  }
}

if (typeof Office === 'undefined') {
  // office.js did not load (no network to the platform's address, or the file opened from disk).
  showOutside(null);
} else {
  const wait = setTimeout(() => {
    if (!started) showOutside(null);
  }, OFFICE_WAIT_MS);
  void Office.onReady().then(
    (info) => {
      clearTimeout(wait);
      start(info.host);
    },
    () => {
      clearTimeout(wait);
      start(null);
    },
  );
}
