import { badRequest, invalidFields, tooLarge } from '@/lib/errors';

/**
 * The one reader of uploaded files (multipart/form-data): a size limit checked while the body is read
 * (413 before any parsing), 400 when the body is not a form or has no file, and, for files read whole,
 * a strict UTF-8 check (422 on the file field, the status every upload gives a file that is not UTF-8)
 * with the byte order mark dropped.
 */

/** An uploaded file read as a stream (a schedule, checked while it is parsed). */
export interface UploadedFile {
  name: string;
  size: number;
  stream(): ReadableStream<Uint8Array>;
}

/** An uploaded file read whole as text, with the form's other (text) fields, trimmed. */
export interface Upload {
  text: string;
  fileName: string;
  fields: Record<string, string>;
}

export interface UploadOptions {
  /** The largest file accepted, in bytes. */
  maxBytes: number;
  /** The form field holding the file; `file` unless said. */
  field?: string;
  /** What the file is, for messages: "the schedule CSV". */
  what?: string;
  /** The 413 message; "The file is larger than N kB." unless said. */
  tooBig?: string;
}

export const NOT_UTF8_MESSAGE =
  'The file is not UTF-8 text. Save it from your spreadsheet as “CSV UTF-8” and upload it again.';

/** Room for the multipart boundaries and headers around the file itself. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

/** Decodes bytes as UTF-8 and drops a byte order mark; bytes that are not UTF-8 are a 422 on `field`. */
export function decodeUtf8(bytes: Uint8Array, field = 'file'): string {
  try {
    return new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(bytes);
  } catch {
    throw invalidFields([{ path: field, message: NOT_UTF8_MESSAGE }], NOT_UTF8_MESSAGE);
  }
}

function statusOf(err: unknown): number | undefined {
  return err instanceof Error && 'status' in err ? (err as { status: number }).status : undefined;
}

/** Reads the form with the byte limit applied to the body as it streams in. */
async function readForm(req: Request, opts: UploadOptions): Promise<{ file: File; fields: Record<string, string> }> {
  const field = opts.field ?? 'file';
  const what = opts.what ?? 'the CSV';
  const tooBig = opts.tooBig ?? `The file is larger than ${Math.round(opts.maxBytes / 1000)} kB.`;
  const limit = opts.maxBytes + MULTIPART_OVERHEAD_BYTES;
  if (Number(req.headers.get('content-length') ?? '0') > limit) throw tooLarge(tooBig);
  const type = req.headers.get('content-type') ?? '';
  if (!/^multipart\/form-data/i.test(type))
    throw badRequest(`Send ${what} as multipart/form-data with the file in the field “${field}”.`);
  if (!req.body) throw badRequest(`The request has no body; attach ${what} in the field “${field}”.`);
  let seen = 0;
  const body = req.body.pipeThrough(
    new TransformStream<Uint8Array, Uint8Array>({
      transform(chunk, controller) {
        seen += chunk.byteLength;
        if (seen > limit) controller.error(tooLarge(tooBig));
        else controller.enqueue(chunk);
      },
    }),
  );
  let form: FormData;
  try {
    form = await new Response(body, { headers: { 'content-type': type } }).formData();
  } catch (err) {
    if (statusOf(err) === 413) throw err;
    const cause = (err as { cause?: unknown }).cause;
    if (statusOf(cause) === 413) throw cause;
    throw badRequest(`The upload could not be read as multipart/form-data. Attach ${what} in the field “${field}”.`);
  }
  const file = form.get(field);
  if (file === null || typeof file === 'string') throw badRequest(`Attach ${what} in the field “${field}”.`);
  if (file.size > opts.maxBytes) throw tooLarge(tooBig);
  const fields: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (k !== field && typeof v === 'string') fields[k] = v.trim();
  return { file, fields };
}

/** The uploaded file as a stream, for files too large to hold as one string; the reader checks UTF-8. */
export async function readUploadedFile(
  req: Request,
  opts: UploadOptions & { defaultName: string },
): Promise<UploadedFile> {
  const { file } = await readForm(req, opts);
  return { name: file.name || opts.defaultName, size: file.size, stream: () => file.stream() };
}

/** The uploaded file as UTF-8 text (byte order mark dropped), with the form's other fields. */
export async function readUpload(req: Request, opts: UploadOptions): Promise<Upload> {
  const { file, fields } = await readForm(req, opts);
  return {
    text: decodeUtf8(new Uint8Array(await file.arrayBuffer()), opts.field ?? 'file'),
    fileName: file.name || 'upload.csv',
    fields,
  };
}
