/** Hands a generated file to the browser as a download (Blob + a[download]); works offline, nothing leaves the tablet. */
export function downloadFile(file: { fileName: string; mimeType: string; text: string }, doc: Document = document): void {
  const url = URL.createObjectURL(new Blob([file.text], { type: file.mimeType }));
  const link = doc.createElement('a');
  link.href = url;
  link.download = file.fileName;
  link.hidden = true;
  doc.body.append(link);
  link.click();
  link.remove();
  // The browser has taken the file once click() returns; the URL is released a moment later so a slow download manager still finds it.
  setTimeout(() => URL.revokeObjectURL(url), 60_000);
}
