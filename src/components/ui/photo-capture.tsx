// "Take or add a photo": opens the phone's camera (or a file picker), uploads, and hands back the
// stored photo; failures say why.
import { useState } from 'react';
import { errorMessage } from '@/lib/api-client';
import { showToast } from '@/lib/toasts';
import { percent, uploadFile } from '@/lib/uploads';

export function PhotoCaptureButton({ onAdded }: { onAdded: (photo: { id: string; url: string }) => void }) {
  // null: not uploading; otherwise the share sent so far.
  const [sent, setSent] = useState<number | null>(null);
  return (
    <label
      className="inline-flex min-h-11 cursor-pointer items-center rounded-md border border-rule-strong bg-paper-raised px-4 font-semibold"
      data-upload-progress={sent === null ? undefined : percent(sent)}
    >
      <span aria-live="polite">{sent !== null ? `Uploading the photo… ${percent(sent)}` : 'Take or add a photo'}</span>
      <input
        type="file"
        accept="image/jpeg,image/png,image/webp"
        capture="environment"
        className="sr-only"
        onChange={async (e) => {
          const file = e.target.files?.[0];
          e.target.value = '';
          if (!file || sent !== null) return;
          setSent(0);
          try {
            const up = await uploadFile(file, { onProgress: setSent });
            onAdded({ id: up.id, url: up.urls.thumb });
          } catch (err) {
            showToast(`The photo was not added: ${errorMessage(err)}`, 'error');
          } finally {
            setSent(null);
          }
        }}
      />
    </label>
  );
}
