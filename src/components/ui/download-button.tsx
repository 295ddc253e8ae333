// A download the server has to build first (a CSV export, a guide file): the button says it is
// busy until the file arrives, and a failure says why instead of saving an error page as the file.
import { useState, type ReactNode } from 'react';
import { ApiError, errorMessage } from '@/lib/api-client';
import { showToast } from '@/lib/toasts';

export function DownloadButton({ href, fileName, className, children }: { href: string; fileName: string; className: string; children: ReactNode }) {
  const [busy, setBusy] = useState(false);
  return (
    <button
      type="button"
      className={className}
      aria-busy={busy || undefined}
      disabled={busy}
      data-download={href}
      onClick={async () => {
        setBusy(true);
        try {
          await downloadFile(href, fileName);
        } catch (err) {
          showToast(`The file could not be downloaded: ${errorMessage(err)}`, 'error');
        } finally {
          setBusy(false);
        }
      }}
    >
      {busy ? (
        <span className="inline-flex items-center gap-2">
          <span className="size-4 animate-spin rounded-full border-2 border-current border-t-transparent" aria-hidden />
          Preparing the file…
        </span>
      ) : (
        children
      )}
    </button>
  );
}

/**
 * Fetches a file (a CSV export) and hands it to the browser as a download, so the page can show a
 * busy state while the server builds it. Throws ApiError when the server refuses.
 */
async function downloadFile(url: string, fallbackName: string): Promise<void> {
  let res: Response;
  try {
    res = await fetch(url, { credentials: 'same-origin' });
  } catch {
    throw new ApiError(0, 'network', 'The file could not be fetched: no connection.');
  }
  if (!res.ok) {
    const body = await res.json().catch(() => ({}));
    throw new ApiError(res.status, body?.error?.code ?? 'internal', body?.error?.message ?? `The download failed (${res.status})`, body?.error?.fields ?? {});
  }
  const blob = await res.blob();
  const disposition = res.headers.get('Content-Disposition') ?? '';
  const name = /filename\*=UTF-8''([^;]+)/i.exec(disposition)?.[1] ?? /filename="?([^";]+)"?/i.exec(disposition)?.[1] ?? fallbackName;
  const href = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = href;
  a.download = decodeURIComponent(name);
  document.body.append(a);
  a.click();
  a.remove();
  // Some browsers read the object URL after click returns.
  setTimeout(() => URL.revokeObjectURL(href), 10_000);
}
