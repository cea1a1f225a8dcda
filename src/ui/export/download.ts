/**
 * Downloads made in the page: a Blob, an object URL and an <a download>.
 * Nothing goes over the network.
 */

/** Byte order mark: lets spreadsheets read UTF-8 (σ, µ, ×) correctly; our own loader skips it. */
const BOM = '\uFEFF';

/** Offer bytes or text to the user as a file. */
export function downloadBlob(data: BlobPart, fileName: string, type: string): void {
  const blob = new Blob([data], { type });
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.rel = 'noopener';
  a.style.display = 'none';
  document.body.appendChild(a);
  a.click();
  a.remove();
  // Revoking at once can cancel the download in some browsers; a minute is plenty.
  setTimeout(() => URL.revokeObjectURL(url), 60_000);
}

/** CSV text as a UTF-8 file with a byte order mark. */
export function downloadCsv(text: string, fileName: string): void {
  downloadBlob(BOM + text, fileName, 'text/csv;charset=utf-8');
}

export function downloadText(text: string, fileName: string, type = 'text/plain;charset=utf-8'): void {
  downloadBlob(text, fileName, type);
}
