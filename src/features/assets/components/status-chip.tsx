// The applicator's status as a word in a chip; the colour only repeats what the word says.
import { APPLICATOR_STATUS_LABELS, type ApplicatorStatus } from '@/shared/schemas/assets';

const TONES: Record<ApplicatorStatus, string> = {
  running: 'bg-fixed-wash text-fixed',
  spare: 'bg-paper-sunk text-ink-soft',
  'out-for-repair': 'bg-amber-wash text-amber-deep',
  retired: 'bg-paper-sunk text-ink-faint',
};

export function StatusChip({ status }: { status: ApplicatorStatus }) {
  return <span className={`inline-flex items-center rounded-full px-2.5 py-0.5 text-sm font-semibold ${TONES[status]}`}>{APPLICATOR_STATUS_LABELS[status]}</span>;
}
