// The guide editor: outline and map side by side over one draft, the selected step's form, the
// problems to fix before review, undo and redo, autosave, and submit.
import { useEffect, useMemo, useState } from 'react';
import { Link, useBlocker, useNavigate, useParams } from 'react-router';
import { listCalculators } from '@/shared/calculators';
import { validateGuide, type DraftStep, type GuideProblem } from '@/shared/guides';
import type { GuideDetail } from '@/shared/schemas/guides';
import { ApiError, errorMessage } from '@/lib/api-client';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { NotFoundPage } from '@/components/errors/route-error';
import { useTags } from '@/lib/tags';
import { uploadFile } from '@/lib/uploads';
import { TagPicker } from '@/components/tags/tag-chips';
import { useCauses, useGuide, useGuideAction, useGuideComparison, usePublishedArticles } from '../api/guides';
import { readGuideBackup, clearGuideBackup, useGuideDraft, type GuideSaveStatus } from '../hooks/use-guide-draft';
import { addChild, addLooseStep, changeKind, deleteStep, moveBranch, updateStep } from '../utils/outline';
import { GuideMap } from './guide-map';
import { GuideOutline } from './guide-outline';
import { StepForm } from './step-form';

const STATUS_WORDS: Record<GuideSaveStatus, string> = {
  saved: 'All changes saved',
  dirty: 'Unsaved changes…',
  saving: 'Saving…',
  offline: 'Waiting for a connection · kept on this device',
  error: 'Not saved',
  conflict: 'Someone else saved: choose what to keep',
};

export function GuideEditorPage() {
  const id = Number(useParams().id);
  const guide = useGuide(id);
  if (guide.isPending) return <LoadingBlock label="Opening the editor" />;
  if (guide.isError) {
    if (guide.error instanceof ApiError && guide.error.status === 404) return <NotFoundPage />;
    return (
      <Notice tone="error" title="The guide could not be opened">
        {errorMessage(guide.error)}
      </Notice>
    );
  }
  if (guide.data.draftState === 'in_review') {
    return (
      <Notice tone="warn" title="This guide is waiting for review">
        Withdraw it from review on{' '}
        <Link className="underline" to={`/guides/${id}`}>
          its page
        </Link>{' '}
        to edit it.
      </Notice>
    );
  }
  return <Editor key={guide.data.id} guide={guide.data} />;
}

function Editor({ guide }: { guide: GuideDetail }) {
  const navigate = useNavigate();
  const d = useGuideDraft(guide);
  const causes = useCauses();
  const tags = useTags();
  const articles = usePublishedArticles();
  const submit = useGuideAction(guide.id);
  const [selected, setSelected] = useState<string | null>(d.value.content.startStepId || null);
  const [view, setView] = useState<'outline' | 'map'>('outline');
  const [showChanges, setShowChanges] = useState(false);
  const comparison = useGuideComparison(guide.id, 'published', 'draft', showChanges && Boolean(guide.published) && Boolean(guide.draft));
  const changes = useMemo(() => {
    if (!showChanges || !comparison.data) return undefined;
    const m = new Map<string, 'added' | 'changed'>();
    for (const s of comparison.data.steps.added) m.set(s.id, 'added');
    for (const s of comparison.data.steps.changed) m.set(s.id, 'changed');
    return m;
  }, [showChanges, comparison.data]);
  const [backup, setBackup] = useState(() => {
    const b = readGuideBackup(guide.id);
    return b && JSON.stringify(b.draft) !== JSON.stringify(d.value) ? b : null;
  });
  const { content, meta } = d.value;

  const validation = useMemo(
    () =>
      validateGuide(content, {
        causeCodes: causes.data?.filter((c) => c.active).map((c) => c.code),
        calculators: listCalculators(),
        articleIds: articles.data?.map((a) => a.id),
      }),
    [content, causes.data, articles.data],
  );
  const problemsByStep = useMemo(() => {
    const m = new Map<string, number>();
    for (const p of validation.errors) if (p.stepId) m.set(p.stepId, (m.get(p.stepId) ?? 0) + 1);
    return m;
  }, [validation]);
  const flagCounts = useMemo(() => Object.fromEntries(Object.entries(guide.flags ?? {}).map(([k, v]) => [k, v.length])), [guide.flags]);

  const apply = (r: { content: typeof content; selected?: string; error?: string }, key?: string) => {
    if (r.error) return showToast(r.error, 'info');
    d.change({ meta, content: r.content }, key);
    if (r.selected) setSelected(r.selected);
  };
  const step = content.steps.find((s) => s.id === selected) ?? null;
  const parentOf = (id: string) => content.steps.find((s) => JSON.stringify(s).includes(`"${id}"`) && s.id !== id)?.id;

  // Ctrl+Z / Ctrl+Shift+Z anywhere outside a text field.
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const inText = (e.target as HTMLElement).closest('input, textarea, select, [contenteditable="true"]');
      if (inText || !(e.ctrlKey || e.metaKey) || e.key.toLowerCase() !== 'z') return;
      e.preventDefault();
      if (e.shiftKey) d.redo();
      else d.undo();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [d]);

  const blocker = useBlocker(({ currentLocation, nextLocation }) => d.unsaved && currentLocation.pathname !== nextLocation.pathname);

  const problemList = (ps: GuideProblem[], tone: 'error' | 'warn') =>
    ps.map((p, i) => (
      <li key={`${tone}-${i}`}>
        <button
          type="button"
          className={`w-full min-h-11 rounded px-2 py-1 text-left text-sm ${tone === 'error' ? 'hover:bg-danger-wash' : 'hover:bg-amber-wash'}`}
          onClick={() => p.stepId && setSelected(p.stepId)}
        >
          <span className={`mr-2 font-semibold ${tone === 'error' ? 'text-danger-deep' : 'text-amber-deep'}`}>{tone === 'error' ? 'Fix' : 'Check'}</span>
          {p.message}
        </button>
      </li>
    ));

  return (
    <div>
      <div className="mb-4 flex flex-wrap items-center justify-between gap-3">
        <div>
          <Link to={`/guides/${guide.id}`} className="text-sm font-semibold text-amber-deep underline">
            Back to the guide
          </Link>
          <h1 className="text-2xl font-semibold">{meta.title || 'Untitled guide'}</h1>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <p
            role="status"
            aria-live="polite"
            data-save-status={d.status}
            className={`text-sm font-semibold ${d.status === 'saved' ? 'text-fixed' : d.status === 'error' || d.status === 'conflict' ? 'text-danger' : 'text-ink-soft'}`}
          >
            {STATUS_WORDS[d.status]}
          </p>
          <Button variant="secondary" onClick={d.undo} disabled={!d.canUndo} aria-keyshortcuts="Control+Z">
            Undo
          </Button>
          <Button variant="secondary" onClick={d.redo} disabled={!d.canRedo} aria-keyshortcuts="Control+Shift+Z">
            Redo
          </Button>
          <Button
            disabled={validation.errors.length > 0 || d.status === 'saving'}
            title={validation.errors.length ? 'Fix the problems listed first' : undefined}
            busy={submit.isPending}
            onClick={async () => {
              if (d.unsaved) await d.save();
              submit.mutate(
                { action: 'submit', baseLockVersion: d.lockVersion() },
                {
                  onSuccess: () => {
                    showToast('Submitted for review', 'ok');
                    navigate(`/guides/${guide.id}`);
                  },
                },
              );
            }}
          >
            Submit for review
          </Button>
        </div>
      </div>

      {backup ? (
        <div className="mb-4">
          <Notice tone="warn" title="Unsaved changes from this device">
            <div className="mt-1 flex flex-wrap gap-2">
              <Button
                onClick={() => {
                  d.change(backup.draft);
                  setBackup(null);
                }}
              >
                Bring them back
              </Button>
              <Button
                variant="secondary"
                onClick={() => {
                  clearGuideBackup(guide.id);
                  setBackup(null);
                }}
              >
                Discard them
              </Button>
            </div>
          </Notice>
        </div>
      ) : null}
      {d.message ? (
        <div className="mb-4">
          <Notice tone={d.status === 'offline' ? 'warn' : 'error'} title={d.message} />
        </div>
      ) : null}

      <details className="mb-4 rounded-lg border border-rule bg-paper-raised p-4" open={!meta.symptom}>
        <summary className="min-h-11 cursor-pointer font-semibold">About this guide: title, symptom, tags</summary>
        <div className="mt-3 grid gap-4 md:grid-cols-2">
          <TextField label="Title" value={meta.title} onChange={(e) => d.change({ content, meta: { ...meta, title: e.target.value } }, 'meta.title')} />
          <TextField
            label="Symptom it starts from"
            value={meta.symptom}
            onChange={(e) => d.change({ content, meta: { ...meta, symptom: e.target.value } }, 'meta.symptom')}
            hint="What the technician sees, in their words: “drips after the valve closes”."
          />
          <TextField className="md:col-span-2" label="Summary" value={meta.summary} onChange={(e) => d.change({ content, meta: { ...meta, summary: e.target.value } }, 'meta.summary')} />
          {tags.data ? (
            <div className="md:col-span-2">
              <TagPicker legend="Tags" tags={tags.data} value={meta.tags} onChange={(t) => d.change({ content, meta: { ...meta, tags: t } })} />
            </div>
          ) : null}
        </div>
      </details>

      <div className="grid gap-4 xl:grid-cols-[minmax(20rem,28rem)_1fr]">
        <section aria-label="Steps" className="space-y-3">
          <div className="flex flex-wrap items-center justify-between gap-2">
            <div role="tablist" aria-label="Show the steps as" className="flex gap-1">
              {(['outline', 'map'] as const).map((v) => (
                <button
                  key={v}
                  role="tab"
                  aria-selected={view === v}
                  onClick={() => setView(v)}
                  className={`min-h-11 rounded-md px-3 font-semibold ${view === v ? 'bg-amber-wash text-amber-deep' : 'text-ink-soft hover:bg-paper-sunk'}`}
                >
                  {v === 'outline' ? 'Outline' : 'Map'}
                </button>
              ))}
            </div>
            {guide.published ? (
              <label className="flex min-h-11 items-center gap-2 text-sm">
                <input type="checkbox" className="size-5" checked={showChanges} onChange={(e) => setShowChanges(e.target.checked)} />
                Mark changes since version {guide.published.number}
              </label>
            ) : null}
          </div>
          {showChanges && comparison.data && comparison.data.steps.removed.length ? (
            <p className="text-sm text-ink-soft">
              Removed since version {guide.published?.number}: {comparison.data.steps.removed.map((r) => r.title || r.id).join('; ')}
            </p>
          ) : null}
          <div className="rounded-lg border border-rule bg-paper-raised p-3">
            {view === 'outline' ? (
              <GuideOutline
                content={content}
                selected={selected}
                problems={validation.errors}
                flags={flagCounts}
                changes={changes}
                actions={{
                  select: setSelected,
                  addChild: (pid) => apply(addChild(content, pid)),
                  addSibling: (pid) => (pid ? apply(addChild(content, pid)) : showToast('The start step has no step beside it: add next steps with Tab', 'info')),
                  setKind: (sid, kind) => apply(changeKind(content, sid, kind)),
                  remove: (sid) => apply(deleteStep(content, sid)),
                  move: (pid, i, by) => apply(moveBranch(content, pid, i, by)),
                }}
              />
            ) : (
              <GuideMap content={content} selected={selected} problemCounts={problemsByStep} onSelect={setSelected} />
            )}
          </div>
          <section aria-label="Problems" className="rounded-lg border border-rule bg-paper-raised p-3">
            <h2 className="font-semibold">
              {validation.errors.length ? `${validation.errors.length} to fix before review` : 'Ready for review'}
              {validation.warnings.length ? ` · ${validation.warnings.length} to check` : ''}
            </h2>
            <ul className="mt-1 max-h-72 overflow-y-auto">
              {problemList(validation.errors, 'error')}
              {problemList(validation.warnings, 'warn')}
            </ul>
          </section>
        </section>

        <section aria-label="Selected step" className="rounded-lg border border-rule bg-paper-raised p-4">
          {step ? (
            <StepForm
              step={step}
              steps={content.steps}
              isStart={content.startStepId === step.id}
              problems={validation.errors.filter((p) => p.stepId === step.id)}
              causes={(causes.data ?? []).filter((c) => c.active)}
              articles={(articles.data ?? []).map((a) => ({ id: a.id, title: a.title }))}
              flags={guide.flags?.[step.id] ?? []}
              onChange={(s: DraftStep, key) => d.change({ meta, content: updateStep(content, s) }, key)}
              onKind={(k) => apply(changeKind(content, step.id, k))}
              onNewTarget={(withTarget) => {
                const r = addLooseStep(content);
                d.change({ meta, content: updateStep(r.content, withTarget(r.id)) });
              }}
              onMakeStart={() => d.change({ meta, content: { ...content, startStepId: step.id } })}
              onDelete={() => {
                apply(deleteStep(content, step.id));
                setSelected(parentOf(step.id) ?? content.startStepId);
              }}
              upload={async (file) => (await uploadFile(file)).urls.display}
            />
          ) : (
            <p className="text-ink-soft">Choose a step in the outline or on the map to edit it.</p>
          )}
        </section>
      </div>

      <Dialog open={d.conflict !== null} title="Someone else changed this guide" onClose={() => undefined}>
        {d.conflict ? (
          <div className="space-y-3">
            <p>{d.conflict.byName ?? 'Another author'} saved the draft while you were editing. Nothing has been overwritten.</p>
            <p className="text-sm text-ink-soft">
              Their draft has {d.conflict.draft.content.steps.length} steps; yours has {content.steps.length}.
            </p>
            <div className="flex flex-wrap justify-end gap-2">
              <Button variant="secondary" onClick={() => void d.resolve('theirs')}>
                Use their draft
              </Button>
              <Button onClick={() => void d.resolve('mine')}>Save mine over theirs</Button>
            </div>
          </div>
        ) : null}
      </Dialog>
      <Dialog open={blocker.state === 'blocked'} title="Leave without saving?" onClose={() => blocker.reset?.()}>
        <p>Some changes have not reached the server yet. They are kept on this device and offered when you come back.</p>
        <div className="mt-4 flex justify-end gap-2">
          <Button variant="secondary" onClick={() => blocker.reset?.()}>
            Stay
          </Button>
          <Button variant="danger" onClick={() => blocker.proceed?.()}>
            Leave
          </Button>
        </div>
      </Dialog>
    </div>
  );
}
