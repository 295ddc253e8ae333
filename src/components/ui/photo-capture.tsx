// "Take or add a photo": opens the phone's camera (or a file picker), uploads, and hands back the
// stored photo; failures say why.
import { useState } from 'react';
import { errorMessage } from '@/lib/api-client';
import { showToast } from '@/lib/toasts';
import { uploadFile } from '@/lib/uploads';

export function PhotoCaptureButton({ onAdded }: { onAdded: (photo: { id: string; url: string }) => void }) {
  const [uploading, setUploading] = useState(false);
  return (
    <label className="inline-flex min-h-11 cursor-pointer items-center rounded-md border border-rule-strong bg-paper-raised px-4 font-semibold">
      {uploading ? 'Uploading…' : 'Take or add a photo'}
      <input
        type="file"
        accept="image/jpeg,image/png,image/webp"
        capture="environment"
        className="sr-only"
        onChange={async (e) => {
          const file = e.target.files?.[0];
          e.target.value = '';
          if (!file) return;
          setUploading(true);
          try {
            const up = await uploadFile(file);
            onAdded({ id: up.id, url: up.urls.thumb });
          } catch (err) {
            showToast(`The photo was not added: ${errorMessage(err)}`, 'error');
          } finally {
            setUploading(false);
          }
        }}
      />
    </label>
  );
}
