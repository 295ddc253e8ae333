// One guide: what it covers and a button to walk it; for authors its state, review actions,
// versions, what changed between them, export and retirement.
import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router';
import { STEP_KIND_LABELS } from '@/shared/guides';
import { useCan, useMe } from '@/lib/auth';
import { useTags } from '@/lib/tags';
import { ApiError, errorMessage } from '@/lib/api-client';
import { showToast } from '@/lib/toasts';
import { Button, ButtonLink } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { DownloadButton } from '@/components/ui/download-button';
import { ListSkeleton, LoadingBlock, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { Card } from '@/components/ui/page';
import { TagList } from '@/components/tags/tag-chips';
import { NotFoundPage } from '@/components/errors/route-error';
import type { GuideDetail } from '@/shared/schemas/guides';
import { useDiscardDraft, useGuide, useGuideAction, useGuideComparison, useGuideWalkOutcomes } from '../api/guides';
import { StepKindBadge } from './step-kind';
import { formatDate, formatDateTime } from '@/lib/format';

function Compare({ guide }: { guide: GuideDetail }) {
  const numbers = guide.versions.map((v) => v.number);
  const [from, setFrom] = useState(guide.published ? String(guide.published.number) : String(numbers[numbers.length - 1] ?? 1));
  const [to, setTo] = useState(guide.draft ? 'draft' : String(numbers[0] ?? 1));
  const cmp = useGuideComparison(guide.id, from, to, from !== to && numbers.length > 0);
  const opts = [...(guide.draft ? [{ v: 'draft', l: 'Current draft' }] : []), ...guide.versions.map((v) => ({ v: String(v.number), l: `Version ${v.number} (${v.state.replace('_', ' ')})` }))];
  return (
    <Card>
      <h2 className="text-lg font-semibold">What changed</h2>
      <div className="mt-2 flex flex-wrap items-end gap-2">
        <label className="text-sm">
          From
          <select className="ml-1 min-h-11 rounded border border-rule-strong bg-paper-raised px-2" value={from} onChange={(e) => setFrom(e.target.value)}>
            {opts.map((o) => (
              <option key={o.v} value={o.v}>
                {o.l}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          to
          <select className="ml-1 min-h-11 rounded border border-rule-strong bg-paper-raised px-2" value={to} onChange={(e) => setTo(e.target.value)}>
            {opts.map((o) => (
              <option key={o.v} value={o.v}>
                {o.l}
              </option>
            ))}
          </select>
        </label>
      </div>
      {from === to ? (
        <p className="mt-2 text-ink-soft">Choose two different versions.</p>
      ) : cmp.isPending ? (
        <LoadingBlock label="Comparing" />
      ) : cmp.isError ? (
        <Notice tone="error" title={errorMessage(cmp.error)} />
      ) : (
        <div className="mt-3 space-y-2 text-sm" data-testid="guide-comparison">
          {Object.entries(cmp.data.meta).map(([k, v]) => (
            <p key={k}>
              <span className="font-semibold">{k}</span>: {'from' in v ? `“${v.from}” → “${v.to}”` : `added ${v.added.join(', ') || 'none'}, removed ${v.removed.join(', ') || 'none'}`}
            </p>
          ))}
          {cmp.data.steps.added.map((s) => (
            <p key={`a-${s.id}`}>
              <span className="rounded bg-fixed-wash px-1 font-semibold text-fixed">Added</span> {STEP_KIND_LABELS[s.kind as keyof typeof STEP_KIND_LABELS] ?? s.kind}: {s.title}
            </p>
          ))}
          {cmp.data.steps.removed.map((s) => (
            <p key={`r-${s.id}`}>
              <span className="rounded bg-paper-sunk px-1 font-semibold">Removed</span> {s.title}
            </p>
          ))}
          {cmp.data.steps.changed.map((s) => (
            <p key={`c-${s.id}`}>
              <span className="rounded bg-amber-wash px-1 font-semibold text-amber-deep">Changed</span> {s.title} <span className="text-ink-soft">({s.fields.join(', ')})</span>
            </p>
          ))}
          <p className="text-ink-soft">{cmp.data.steps.unchanged} steps unchanged.</p>
        </div>
      )}
    </Card>
  );
}

function NotFixedWalks({ guideId }: { guideId: number }) {
  const walks = useGuideWalkOutcomes(guideId, true);
  const misses = (walks.data ?? []).filter((w) => w.outcome === 'not-fixed' || w.outcome === 'fixed-by-other');
  return (
    <Card>
      <h2 className="text-lg font-semibold">Walks that did not end in the guide’s fix</h2>
      {walks.isPending ? (
        <ListSkeleton label="Loading walks" rows={3} />
      ) : misses.length === 0 ? (
        <p className="mt-1 text-ink-soft">None so far{walks.data?.length ? ` out of ${walks.data.length} finished walks` : ''}.</p>
      ) : (
        <ul className="mt-2 divide-y divide-rule">
          {misses.map((w) => (
            <li key={w.id}>
              <Link to={`/walks/${w.id}/summary`} className="flex min-h-11 flex-wrap items-center justify-between gap-2 py-2 hover:text-amber-deep">
                <span>
                  <span className="font-semibold">{w.outcome === 'not-fixed' ? 'Not fixed' : 'Fixed by something else'}</span>
                  {w.outcomeNote ? `: ${w.outcomeNote}` : ''}
                </span>
                <span className="text-sm text-ink-soft">
                  v{w.versionNumber} · {w.userName ?? '—'}
                  {w.line ? ` · ${w.line}` : ''} · {w.endedAt ? formatDate(w.endedAt) : ''}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}

function AuthorPanel({ guide }: { guide: GuideDetail }) {
  const { data: me } = useMe();
  const canReview = useCan('guides:review');
  const action = useGuideAction(guide.id);
  const discard = useDiscardDraft(guide.id);
  const navigate = useNavigate();
  const [sendBack, setSendBack] = useState(false);
  const [comment, setComment] = useState('');
  const d = guide.draft;
  const run = (a: Parameters<typeof action.mutate>[0]['action'], done: string, extra: { comment?: string } = {}) =>
    action.mutate({ action: a, baseLockVersion: guide.lockVersion ?? undefined, ...extra }, { onSuccess: () => showToast(done, 'ok') });
  return (
    <Card className="no-print">
      <h2 className="text-lg font-semibold">State</h2>
      <p className="mt-1">
        {guide.status === 'retired'
          ? 'Retired: no new walks start on it.'
          : guide.published
            ? `Version ${guide.published.number} is published${guide.published.publishedAt ? ` since ${formatDate(guide.published.publishedAt)}` : ''}.`
            : 'Not published yet.'}
        {d ? ` A draft (version ${d.number}) is ${d.state === 'in_review' ? `waiting for review${d.submittedByName ? `, submitted by ${d.submittedByName}` : ''}` : 'being edited'}.` : ''}
      </p>
      {d ? (
        <p className={`mt-1 text-sm font-semibold ${d.validation.errors.length ? 'text-danger-deep' : 'text-fixed'}`}>
          {d.validation.errors.length ? `${d.validation.errors.length} problems to fix before review` : 'The draft passes every check'}
          {d.validation.warnings.length ? ` · ${d.validation.warnings.length} to check` : ''}
        </p>
      ) : null}
      {d?.reviewComment && d.state === 'draft' ? (
        <div className="mt-2">
          <Notice tone="warn" title="The reviewer asked for changes">
            {d.reviewComment}
          </Notice>
        </div>
      ) : null}
      <div className="mt-3 flex flex-wrap gap-2">
        {d?.state === 'draft' ? <ButtonLink to={`/guides/${guide.id}/edit`}>Edit draft</ButtonLink> : null}
        {!d && guide.status === 'active' ? (
          <Button onClick={() => action.mutate({ action: 'draft' }, { onSuccess: () => navigate(`/guides/${guide.id}/edit`) })}>Edit (start a new draft)</Button>
        ) : null}
        {d?.state === 'draft' ? (
          <Button variant="secondary" disabled={d.validation.errors.length > 0} busy={action.isPending} onClick={() => run('submit', 'Submitted for review')}>
            Submit for review
          </Button>
        ) : null}
        {d?.state === 'in_review' && canReview && d.submittedById !== me?.user.id ? (
          <>
            <Button busy={action.isPending} onClick={() => run('approve', 'Approved and published')}>
              Approve and publish
            </Button>
            <Button variant="secondary" onClick={() => setSendBack(true)}>
              Send back with a comment
            </Button>
          </>
        ) : null}
        {d?.state === 'in_review' && d.submittedById === me?.user.id ? (
          <Button variant="secondary" busy={action.isPending} onClick={() => run('withdraw', 'Withdrawn from review')}>
            Withdraw to edit
          </Button>
        ) : null}
        {d && guide.published && d.state === 'draft' ? (
          <Button
            variant="quiet"
            onClick={() => window.confirm('Throw away the draft? The published version stays.') && discard.mutate(undefined, { onSuccess: () => showToast('Draft discarded', 'ok') })}
          >
            Discard draft
          </Button>
        ) : null}
        <DownloadButton
          className="inline-flex min-h-11 items-center rounded-md border border-rule-strong bg-paper-raised px-4 font-semibold hover:bg-paper-sunk"
          href={`/api/guides/${guide.id}/export${guide.published ? '?version=published' : '?version=draft'}`}
          fileName={`guide-${guide.id}.json`}
        >
          Export file
        </DownloadButton>
        {guide.status === 'active' ? (
          <Button variant="quiet" onClick={() => window.confirm('Retire this guide? No new walks will start on it; its history stays.') && run('retire', 'Guide retired')}>
            Retire
          </Button>
        ) : (
          <Button variant="secondary" onClick={() => run('restore', 'Guide restored')}>
            Bring back
          </Button>
        )}
      </div>
      <Dialog open={sendBack} title="Send back to the author" onClose={() => setSendBack(false)}>
        <form
          className="space-y-4"
          onSubmit={(e) => {
            e.preventDefault();
            if (comment.trim())
              action.mutate(
                { action: 'request-changes', comment, baseLockVersion: guide.lockVersion ?? undefined },
                {
                  onSuccess: () => {
                    setSendBack(false);
                    showToast('Sent back', 'ok');
                  },
                },
              );
          }}
        >
          <TextField label="What should change?" value={comment} onChange={(e) => setComment(e.target.value)} autoFocus />
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setSendBack(false)}>
              Cancel
            </Button>
            <Button type="submit" disabled={!comment.trim()}>
              Send back
            </Button>
          </div>
        </form>
      </Dialog>
    </Card>
  );
}

export function GuidePage() {
  const id = Number(useParams().id);
  const isAuthor = useCan('guides:write');
  const canWalk = useCan('walks:run');
  const guide = useGuide(id);
  const tags = useTags();
  if (guide.isPending) return <LoadingBlock label="Loading the guide" />;
  if (guide.isError) {
    if (guide.error instanceof ApiError && guide.error.status === 404) return <NotFoundPage />;
    return (
      <Notice tone="error" title="The guide could not be loaded">
        {errorMessage(guide.error)}
      </Notice>
    );
  }
  const g = guide.data;
  const v = (isAuthor ? (g.draft ?? g.published) : g.published)!;
  const counts = v.content.steps.reduce<Record<string, number>>((m, s) => ({ ...m, [s.kind]: (m[s.kind] ?? 0) + 1 }), {});
  return (
    <div className="mx-auto max-w-4xl space-y-5">
      <nav className="text-sm">
        <Link to="/guides" className="inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
          All guides
        </Link>
      </nav>
      <header>
        <p className="font-semibold text-amber-deep">{v.meta.symptom}</p>
        <h1 className="text-3xl font-semibold">{v.meta.title}</h1>
        {v.meta.summary ? <p className="mt-2 text-lg text-ink-soft">{v.meta.summary}</p> : null}
        <div className="mt-2 flex flex-wrap items-center gap-2">
          <TagList slugs={v.meta.tags} tags={tags.data ?? []} />
        </div>
        <p className="mt-2 flex flex-wrap gap-2 text-sm text-ink-soft">
          {Object.entries(counts).map(([k, n]) => (
            <span key={k} className="inline-flex items-center gap-1">
              <StepKindBadge kind={k as keyof typeof STEP_KIND_LABELS} /> ×{n}
            </span>
          ))}
        </p>
      </header>
      <div className="flex flex-wrap gap-2">
        {canWalk && g.published && g.status === 'active' ? (
          <ButtonLink to={`/guides/${g.id}/walk`} className="w-full sm:w-auto">
            Start walk
          </ButtonLink>
        ) : null}
        {g.published ? (
          <ButtonLink to={`/guides/${g.id}/print`} variant="secondary" className="w-full sm:w-auto">
            Print outline
          </ButtonLink>
        ) : null}
      </div>
      {isAuthor ? <AuthorPanel guide={g} /> : null}
      {isAuthor && g.published ? <NotFixedWalks guideId={g.id} /> : null}
      {isAuthor && g.versions.length ? <Compare guide={g} /> : null}
      {isAuthor && g.events.length ? (
        <Card>
          <h2 className="text-lg font-semibold">History</h2>
          <ul className="mt-2 space-y-1 text-sm">
            {g.events.slice(0, 20).map((e, i) => (
              <li key={i}>
                {formatDateTime(e.createdAt)} · {e.kind.replace('_', ' ')}
                {e.versionNumber ? ` (version ${e.versionNumber})` : ''}
                {e.userName ? ` by ${e.userName}` : ''}
                {e.comment ? `: “${e.comment}”` : ''}
              </li>
            ))}
          </ul>
        </Card>
      ) : null}
    </div>
  );
}
