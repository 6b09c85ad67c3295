/**
 * Saves text as a file through the browser's download: a Blob URL clicked on a temporary link.
 * Works in the desktop window and in the browser host (the page's policy allows blob: URLs).
 */
export function downloadText(fileName: string, text: string, mimeType: string): void {
  const url = URL.createObjectURL(new Blob([text], { type: mimeType }));
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  link.hidden = true;
  document.body.append(link);
  link.click();
  link.remove();
  // Revoke later: some engines read the URL after click() returns.
  window.setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
