/** The report download: the sheets written into an .xlsx file, handed to the browser through a Blob URL. */
import type { SheetSpec } from '../core/report/types';
import { writeWorkbook, type PrintStamp } from '../files';
import type { ReportFile } from './workerEngine';

const XLSX_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';

/** Builds the workbook (its printed pages stamped with the run) and starts the download; the Blob URL is released
 * once the click has been handled. */
export async function downloadReport(sheets: readonly SheetSpec[], fileName: string, stamp: PrintStamp = {}): Promise<void> {
  downloadBlob(xlsxBlob(await writeWorkbook(sheets, stamp)), fileName);
}

/** A report's .xlsx bytes as a Blob of its media type. */
export function xlsxBlob(bytes: Uint8Array): Blob {
  return new Blob([bytes as Uint8Array<ArrayBuffer>], { type: XLSX_TYPE });
}

/** Starts the download of a written report under `fileName`: through the blob: address the worker made when there
 * is one (released once the click has been handled), else through one made here. */
export function downloadReportFile(file: ReportFile, fileName: string): void {
  if (file.url === null) {
    downloadBlob(file.blob, fileName);
    return;
  }
  clickDownload(file.url, fileName);
  if (file.release !== undefined) setTimeout(file.release, 10_000);
}

/** Follows a download link to `url` under `fileName`. */
function clickDownload(url: string, fileName: string): void {
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  link.style.display = 'none';
  document.body.appendChild(link);
  link.click();
  link.remove();
}

/** Starts a download of `blob` under `fileName`. */
export function downloadBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob);
  clickDownload(url, fileName);
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** A file name for the report from the run time: "longipane-report-2026-12-02-0415.xlsx". */
export function reportFileName(now: Date): string {
  const iso = now.toISOString();
  return `longipane-report-${iso.slice(0, 10)}-${iso.slice(11, 13)}${iso.slice(14, 16)}.xlsx`;
}
