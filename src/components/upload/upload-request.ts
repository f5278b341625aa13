/**
 * Sends a form with XMLHttpRequest so the page can show upload progress (fetch cannot report
 * it), and reads the answer the way the typed client does (src/lib/api/client.ts): the data, or the error shape.
 */
import { errorFromAnswer } from '../../lib/api/errors';
import { resultFromAnswer, type ApiResult } from '../../lib/api/client';

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
    request.onerror = () => resolve({ ok: false, status: 0, error: errorFromAnswer(0, null) });
    request.onload = () => resolve(resultFromAnswer<T>(request.status, request.responseText));
    request.send(form);
  });
}
