import { fileStem } from './text';

/** Headers for a file download: an ASCII file name plus the RFC 6266 UTF-8 form. */
export function attachmentHeaders(
  name: string,
  ext: 'pdf' | 'csv' | 'zip',
  contentType: string,
): Record<string, string> {
  const ascii = `${fileStem(name)}.${ext}`;
  // Characters no file system takes, and control characters, never reach the saved file's name.
  const readable =
    name
      .replace(/[\\/:*?"<>|\u0000-\u001f\u007f]+/g, ' ')
      .replace(/\s+/g, ' ')
      .trim()
      .slice(0, 120) || fileStem(name);
  const encoded = encodeURIComponent(`${readable}.${ext}`).replace(
    /['()*]/g,
    (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`,
  );
  return {
    'content-type': contentType,
    'content-disposition': `attachment; filename="${ascii}"; filename*=UTF-8''${encoded}`,
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
  };
}
