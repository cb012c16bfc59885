import { errorBodySchema } from '@turnstone/contracts/errors';
import { uploadResultSchema, type UploadResult } from '@turnstone/contracts/uploads';
import { ApiError } from '../../../lib/api-client.ts';

/**
 * Sends one recording as multipart/form-data with XMLHttpRequest, which (unlike fetch)
 * reports upload progress. The session cookie goes along (same origin).
 */
export function uploadRecording(
  pointId: number,
  file: File,
  fields: Record<string, string>,
  onProgress: (fraction: number) => void,
  signal?: AbortSignal,
): Promise<UploadResult> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api/v1/points/${pointId}/uploads`);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      let json: unknown;
      try {
        json = JSON.parse(xhr.responseText);
      } catch {
        json = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        const parsed = uploadResultSchema.safeParse(json);
        if (parsed.success) {
          onProgress(1);
          resolve(parsed.data);
        } else
          reject(
            new ApiError(
              xhr.status,
              'invalid_response',
              'The server sent an answer this app does not understand.',
            ),
          );
        return;
      }
      const body = errorBodySchema.safeParse(json);
      reject(
        body.success
          ? new ApiError(
              xhr.status,
              body.data.error.code,
              body.data.error.message,
              body.data.error.details,
            )
          : new ApiError(xhr.status, 'http_error', `The server answered ${xhr.status}.`),
      );
    };
    xhr.onerror = () =>
      reject(
        new ApiError(
          0,
          'network_error',
          'Could not reach the Turnstone server. Check the connection and try again.',
        ),
      );
    xhr.onabort = () => reject(new DOMException('Upload cancelled', 'AbortError'));
    signal?.addEventListener('abort', () => xhr.abort());
    const form = new FormData();
    for (const [k, v] of Object.entries(fields)) if (v !== '') form.append(k, v);
    form.append('file', file, file.name);
    xhr.send(form);
  });
}
