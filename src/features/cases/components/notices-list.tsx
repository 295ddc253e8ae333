// In-app notices on the home page: cases handed or assigned to this person. Hidden when there are none.
import { Link } from 'react-router';
import { Card } from '@/components/ui/page';
import { useNotices, useReadNotice } from '../api/cases';
import { since } from './case-bits';

export function NoticesList() {
  const notices = useNotices();
  const read = useReadNotice();
  const list = notices.data?.notices.filter((n) => !n.readAt || Date.now() - new Date(n.createdAt).getTime() < 7 * 86400_000) ?? [];
  if (!list.length) return null;
  return (
    <Card>
      <h2 className="text-lg font-semibold">For you{notices.data?.unread ? <span className="ml-2 rounded-full bg-amber px-2 text-sm text-white tabular">{notices.data.unread} new</span> : null}</h2>
      <ul className="mt-2 space-y-2">
        {list.slice(0, 6).map((n) => (
          <li key={n.id} data-notice={n.kind} className={`rounded-md border p-3 ${n.readAt ? 'border-rule' : 'border-amber-line bg-amber-wash'}`}>
            {n.caseId ? (
              <Link to={`/cases/${n.caseId}`} onClick={() => !n.readAt && read.mutate(n.id)} className="font-semibold text-amber-deep underline">
                {n.title}
              </Link>
            ) : (
              <p className="font-semibold">{n.title}</p>
            )}
            {n.body ? <p className="mt-1 text-sm">{n.body}</p> : null}
            <p className="mt-1 flex items-center justify-between gap-2 text-sm text-ink-soft">
              <span>{since(n.createdAt)}</span>
              {!n.readAt ? (
                <button type="button" className="min-h-11 px-2 underline" onClick={() => read.mutate(n.id)}>
                  Mark as read
                </button>
              ) : null}
            </p>
          </li>
        ))}
      </ul>
    </Card>
  );
}
