// The walk runner's dialogs (a note or photo, a flag for the authors, stopping the walk), loaded
// the first time one is opened so the step itself shows sooner on a slow phone.
import { useState } from 'react';
import { errorMessage } from '@/lib/api-client';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Notice } from '@/components/ui/feedback';
import { inputClass } from '@/components/ui/field';
import { PhotoCaptureButton } from '@/components/ui/photo-capture';
import { useAbandonWalk, useFlagStep } from '../api/walks';

export function NoteDialog({ open, onClose, onSave }: { open: boolean; onClose: () => void; onSave: (text: string, fileIds: string[]) => Promise<void> }) {
  const [text, setText] = useState('');
  const [files, setFiles] = useState<{ id: string; url: string }[]>([]);
  return (
    <Dialog open={open} title="Note or photo" onClose={onClose}>
      <div className="space-y-3">
        <textarea aria-label="Note" className={inputClass} rows={3} value={text} onChange={(e) => setText(e.target.value)} placeholder="What you saw or did" />
        <PhotoCaptureButton onAdded={(photo) => setFiles((x) => [...x, photo])} />
        <div className="flex flex-wrap gap-2">
          {files.map((f) => (
            <img key={f.id} src={f.url} alt="Photo added to the note" className="size-20 rounded object-cover" />
          ))}
        </div>
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button
            disabled={!text.trim() && !files.length}
            onClick={async () => {
              await onSave(
                text.trim(),
                files.map((f) => f.id),
              );
              setText('');
              setFiles([]);
              onClose();
            }}
          >
            Keep it
          </Button>
        </div>
      </div>
    </Dialog>
  );
}

export function FlagDialog({ open, onClose, walkId, stepId }: { open: boolean; onClose: () => void; walkId: number; stepId: string }) {
  const flag = useFlagStep(walkId);
  const [comment, setComment] = useState('');
  return (
    <Dialog open={open} title="What is wrong or unclear?" onClose={onClose}>
      <form
        className="space-y-3"
        onSubmit={(e) => {
          e.preventDefault();
          flag.mutate(
            { stepId, comment },
            {
              onSuccess: () => {
                setComment('');
                onClose();
                showToast('Thank you: the guide’s authors will see it', 'ok');
              },
            },
          );
        }}
      >
        <textarea
          aria-label="Comment for the authors"
          className={inputClass}
          rows={3}
          value={comment}
          onChange={(e) => setComment(e.target.value)}
          placeholder="e.g. the reading was 40 Ω and no band fits"
        />
        {flag.isError ? <Notice tone="error" title={errorMessage(flag.error)} /> : null}
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" disabled={!comment.trim()} busy={flag.isPending}>
            Send to the authors
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

export function AbandonDialog({ open, onClose, walkId, onStopped }: { open: boolean; onClose: () => void; walkId: number; onStopped: () => void }) {
  const abandon = useAbandonWalk(walkId);
  return (
    <Dialog open={open} title="Stop this walk?" onClose={onClose}>
      <p>The walk is kept as stopped at this step, with what you recorded.</p>
      <div className="mt-4 flex justify-end gap-2">
        <Button variant="secondary" onClick={onClose}>
          Carry on
        </Button>
        <Button variant="danger" busy={abandon.isPending} onClick={() => abandon.mutate(undefined, { onSuccess: onStopped })}>
          Stop the walk
        </Button>
      </div>
    </Dialog>
  );
}
