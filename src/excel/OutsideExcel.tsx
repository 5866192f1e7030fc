/**
 * What the task pane page shows when it is not running inside Excel: opened on its own in a browser (no Office host,
 * or the Office script could not load), or opened in another Office application. It says what Longipane is, that
 * this page runs inside Excel, how to add it, and links to the browser page. Relative links only, so it works under
 * any address the files are served from; it loads nothing.
 */
import type { CSSProperties } from 'react';

const page: CSSProperties = { maxWidth: '40rem', padding: '16px 20px', lineHeight: 1.45, color: '#1f1f1f' };
const heading: CSSProperties = { fontSize: '20px', fontWeight: 600, margin: '4px 0 8px 0' };
const subheading: CSSProperties = { fontSize: '15px', fontWeight: 600, margin: '16px 0 4px 0' };

export interface OutsideExcelProps {
  /** The Office application the page was opened in, when it is one other than Excel (e.g. "Word"); else null. */
  readonly otherHost: string | null;
}

/** The plain message for a task pane page opened outside Excel. */
export function OutsideExcel({ otherHost }: OutsideExcelProps) {
  return (
    <main style={page} aria-labelledby="outside-excel-title">
      <h1 id="outside-excel-title" style={heading}>
        Longipane for Excel
      </h1>
      <p>
        Longipane checks visit timing against the protocol&apos;s visit windows and fits a random-intercept mixed
        model to repeated measurements. This page is its pane for Excel, and it runs only inside Excel
        {otherHost === null ? ': opened on its own, as here, it has no workbook to work on.' : `, not in ${otherHost}.`}
      </p>
      <h2 style={subheading}>Add it to Excel</h2>
      <p>
        If it has been added for you, open it from the Longipane button on Excel&apos;s Home tab (
        <b>Visits and model</b>). If not, ask the person who looks after Longipane in your organisation to add it, or
        add it yourself with its manifest file: <a href="manifest.xml" download="manifest.xml">download manifest.xml</a>.
      </p>
      <ul>
        <li>
          Excel on the web: Home → Add-ins → More Settings → Upload My Add-in, then choose the manifest file.
        </li>
        <li>
          Excel on Windows: from a shared network folder that holds the manifest, added under File → Options → Trust
          Center → Trust Center Settings → Trusted Add-in Catalogs; then Home → Add-ins → Advanced → Shared Folder.
        </li>
        <li>
          Excel on Mac: copy the manifest into ~/Library/Containers/com.microsoft.Excel/Data/Documents/wef, restart
          Excel, then Home → Add-ins.
        </li>
      </ul>
      <h2 style={subheading}>Without Excel</h2>
      <p>
        The browser page does the same with a CSV or .xlsx file from your computer, entirely inside your browser:{' '}
        <a href="index.html">open the browser page</a>. Nothing is sent anywhere, from either page.
      </p>
    </main>
  );
}
