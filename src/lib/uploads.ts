// Uploading one file (multipart); the JSON fetch helper does not fit here.
import { ApiError } from './api-client';

export interface UploadedFile {
  id: string;
  kind: 'photo' | 'document';
  urls: Record<string, string>;
  originalName: string;
}

export async function uploadFile(file: File): Promise<UploadedFile> {
  const form = new FormData();
  form.append('file', file);
  let res: Response;
  try {
    res = await fetch('/api/files', { method: 'POST', body: form, credentials: 'same-origin' });
  } catch {
    throw new ApiError(0, 'network', 'The file could not be sent: no connection.');
  }
  const body = await res.json().catch(() => ({}));
  if (!res.ok) throw new ApiError(res.status, body?.error?.code ?? 'internal', body?.error?.message ?? `Upload failed (${res.status})`, body?.error?.fields ?? {});
  return body.file;
}
