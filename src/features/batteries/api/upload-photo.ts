import { z } from 'zod';
import { PhotoSchema, type Photo } from '../../../../shared/schemas/inspection';
import { ApiError, csrfTokenForUpload } from '../../../lib/api-client';

const PhotoResponseSchema = z.object({ photo: PhotoSchema });
const ErrorSchema = z.object({ error: z.object({ message: z.string() }) });

/**
 * POST /api/batteries/:id/photos with upload progress (fetch cannot report it, so this uses
 * XMLHttpRequest). `onProgress` gets the share sent, 0 to 1.
 */
export async function uploadPhoto(batteryId: number, file: File, itemId: number | null, onProgress: (fraction: number) => void): Promise<Photo> {
  const token = await csrfTokenForUpload();
  const form = new FormData();
  if (itemId !== null) form.append('item', String(itemId)); // fields before the file: the server reads them as they arrive
  form.append('file', file, file.name);
  return new Promise<Photo>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api/batteries/${batteryId}/photos`);
    xhr.setRequestHeader('X-CSRF-Token', token);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.withCredentials = true;
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable && e.total > 0) onProgress(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError(0, 'The upload did not reach the server. Check the connection and try again.'));
    xhr.onload = () => {
      let body: unknown;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = undefined;
      }
      if (xhr.status === 201) {
        const parsed = PhotoResponseSchema.safeParse(body);
        return parsed.success ? resolve(parsed.data.photo) : reject(new ApiError(xhr.status, 'The server answered in an unexpected shape.'));
      }
      const error = ErrorSchema.safeParse(body);
      reject(new ApiError(xhr.status, error.success ? error.data.error.message : `Upload failed (${xhr.status}).`));
    };
    xhr.send(form);
  });
}
