import { fileStem } from './text';

/** Headers for a file download: an ASCII file name plus the RFC 6266 UTF-8 form. */
export function attachmentHeaders(name: string, ext: 'pdf' | 'csv', contentType: string): Record<string, string> {
  const ascii = `${fileStem(name)}.${ext}`;
  return {
    'content-type': contentType,
    'content-disposition': `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(`${name}.${ext}`)}`,
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
  };
}
