// Sending files and large bodies with progress (XMLHttpRequest reports upload progress; fetch does
// not). On one bar of signal a 5 MB photo takes a while: the
// person sees how far it has got instead of a button that looks stuck.
import type { ErrorCode } from '@/shared/errors';
import { ApiError } from './api-client';

export interface UploadedFile {
  id: string;
  kind: 'photo' | 'document';
  urls: Record<string, string>;
  originalName: string;
}

export interface ProgressOptions {
  /** Share of the body sent so far, 0 to 1; called often while sending, and with 1 at the end. */
  onProgress?: (fraction: number) => void;
  signal?: AbortSignal;
  /** Extra request headers, e.g. a CSV body's Content-Type. */
  headers?: Record<string, string>;
}

/**
 * Sends a body to the API and resolves with the parsed JSON answer; failures throw ApiError like
 * the JSON helper does (status 0 for no connection). A plain object is sent as JSON.
 */
export function sendWithProgress<T>(method: 'POST' | 'PUT' | 'PATCH', url: string, body: FormData | Blob | string | object, options: ProgressOptions = {}): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open(method, url);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    for (const [k, v] of Object.entries(options.headers ?? {})) xhr.setRequestHeader(k, v);
    let payload: XMLHttpRequestBodyInit;
    if (body instanceof FormData || body instanceof Blob || typeof body === 'string') {
      payload = body;
    } else {
      xhr.setRequestHeader('Content-Type', 'application/json');
      payload = JSON.stringify(body);
    }
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable && e.total > 0) options.onProgress?.(Math.min(1, e.loaded / e.total));
    };
    xhr.onload = () => {
      let parsed: { error?: { code?: string; message?: string; fields?: Record<string, string>; requestId?: string; details?: Record<string, unknown> } } & Record<string, unknown> = {};
      try {
        parsed = xhr.responseText ? JSON.parse(xhr.responseText) : {};
      } catch {
        // not JSON: a proxy's error page; the status says enough
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        options.onProgress?.(1);
        resolve(parsed as T);
      } else {
        reject(
          new ApiError(
            xhr.status,
            (parsed.error?.code ?? 'internal') as ErrorCode,
            parsed.error?.message ?? `The server answered ${xhr.status}`,
            parsed.error?.fields ?? {},
            parsed.error?.requestId,
            parsed.error?.details,
          ),
        );
      }
    };
    xhr.onerror = () => reject(new ApiError(0, 'network', 'It could not be sent: no connection.'));
    xhr.ontimeout = xhr.onerror;
    xhr.onabort = () => reject(new DOMException('The upload was stopped', 'AbortError'));
    options.signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    xhr.send(payload);
  });
}

export async function uploadFile(file: File, options: ProgressOptions = {}): Promise<UploadedFile> {
  const form = new FormData();
  form.append('file', file);
  try {
    const body = await sendWithProgress<{ file: UploadedFile }>('POST', '/api/files', form, options);
    return body.file;
  } catch (err) {
    if (err instanceof ApiError && err.status === 0) throw new ApiError(0, 'network', 'The file could not be sent: no connection.');
    throw err;
  }
}

/** "42%" for a share in 0..1, whole percent. */
export function percent(fraction: number): string {
  return `${Math.round(Math.max(0, Math.min(1, fraction)) * 100)}%`;
}
