import { z } from 'zod';
import { ApiError, csrfTokenForUpload } from './api-client';

const ErrorSchema = z.object({ error: z.object({ message: z.string(), fields: z.record(z.string(), z.unknown()).optional() }) });

/** Per-field messages of an error answer, as api() gives them. */
function fieldMessages(fields: Record<string, unknown> | undefined): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [name, value] of Object.entries(fields ?? {})) out[name] = Array.isArray(value) ? value.map(String).join(' ') : String(value);
  return out;
}

/**
 * POSTs a multipart form with upload progress (fetch cannot report it, so this uses
 * XMLHttpRequest), with the CSRF header, and checks the answer with `schema` as api() does.
 * `onUploadProgress` gets the share sent, 0 to 1.
 */
export async function postFormWithProgress<T>(path: string, form: FormData, schema: z.ZodType<T>, onUploadProgress: (fraction: number) => void): Promise<T> {
  const token = await csrfTokenForUpload();
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', path);
    xhr.setRequestHeader('X-CSRF-Token', token);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.withCredentials = true;
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable && e.total > 0) onUploadProgress(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError(0, 'The upload did not reach the server. Check the connection and try again.'));
    xhr.onload = () => {
      let body: unknown;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        const parsed = schema.safeParse(body);
        return parsed.success ? resolve(parsed.data) : reject(new ApiError(xhr.status, 'The server answered in an unexpected shape.'));
      }
      const error = ErrorSchema.safeParse(body);
      reject(error.success ? new ApiError(xhr.status, error.data.error.message, fieldMessages(error.data.error.fields)) : new ApiError(xhr.status, `Upload failed (${xhr.status}).`));
    };
    xhr.send(form);
  });
}
