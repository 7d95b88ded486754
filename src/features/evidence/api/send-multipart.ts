import { ApiError } from '@/lib/api-client';

export interface MultipartResult<T> {
  status: number;
  body: T;
}

/**
 * POSTs a form with XMLHttpRequest, the one browser API that reports upload progress.
 * Same-origin cookies go along; a non-2xx answer is thrown as an ApiError, like every API call.
 */
export function sendMultipart<T>(url: string, form: FormData, opts: { onProgress?: (fraction: number) => void; signal?: AbortSignal } = {}): Promise<MultipartResult<T>> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.responseType = 'text';
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable && e.total > 0) opts.onProgress?.(Math.min(1, e.loaded / e.total));
    };
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        body = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        opts.onProgress?.(1);
        resolve({ status: xhr.status, body: body as T });
        return;
      }
      const err = (body as { error?: { code?: string; message?: string; fields?: Record<string, string> } } | null)?.error;
      const e = new ApiError({
        status: xhr.status,
        code: err?.code ?? `http_${xhr.status}`,
        message: err?.message ?? (xhr.status === 413 ? 'That file is too large.' : xhr.status === 415 ? 'That file type is not accepted.' : 'The upload failed. Try again.'),
        fields: err?.fields,
      });
      (e as ApiError & { body?: unknown }).body = body;
      reject(e);
    };
    xhr.onerror = () => reject(new ApiError({ status: 0, code: 'network_error', message: 'The upload was interrupted. Check the connection and try again.' }));
    xhr.onabort = () => reject(new DOMException('Upload cancelled', 'AbortError'));
    opts.signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    xhr.send(form);
  });
}
