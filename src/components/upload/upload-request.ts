/**
 * Sends a form with XMLHttpRequest so the page can show upload progress (fetch cannot report
 * it), and reads the answer the way callApi does: JSON data, or api.md's error shape as one message.
 */
import type { ApiResult } from '../api-client';

/**
 * Posts a multipart form and reports the share sent.
 * @param url same-site address, e.g. `/api/studies/{id}/waves`.
 * @param form the form data.
 * @param onProgress called with the share of the body sent, 0 to 1.
 * @returns the parsed answer or the error's code and message.
 */
export function postWithProgress<T>(url: string, form: FormData, onProgress: (share: number) => void): Promise<ApiResult<T>> {
  return new Promise((resolve) => {
    const request = new XMLHttpRequest();
    request.open('POST', url);
    request.setRequestHeader('Accept', 'application/json');
    request.withCredentials = true;
    request.upload.onprogress = (event) => {
      if (event.lengthComputable && event.total > 0) onProgress(event.loaded / event.total);
    };
    request.upload.onload = () => onProgress(1);
    request.onerror = () => resolve({ ok: false, status: 0, code: 'network', message: 'The server could not be reached. Check the connection and try again.' });
    request.onload = () => {
      let data: unknown = null;
      try {
        data = request.responseText ? JSON.parse(request.responseText) : null;
      } catch {
        data = null;
      }
      if (request.status >= 200 && request.status < 300) {
        resolve({ ok: true, status: request.status, data: data as T });
        return;
      }
      const error = (data as { error?: { code?: string; message?: string } } | null)?.error;
      resolve({ ok: false, status: request.status, code: error?.code ?? 'error', message: error?.message ?? `The server answered ${request.status}.` });
    };
    request.send(form);
  });
}
