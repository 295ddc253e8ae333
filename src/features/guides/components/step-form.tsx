// The form of one step, by kind. Every field edits the draft directly (undo covers it); problems
// the validator finds for this step are listed at the top, worded for the author.
import { useId, type ReactNode } from 'react';
import { listCalculators } from '@/shared/calculators';
import { STEP_KINDS, STEP_KIND_LABELS, describeBand, type DraftStep, type GuideProblem } from '@/shared/guides';
import { HAZARDS, HAZARD_KEYS, type Hazard } from '@/shared/tags';
import { KIND_LABELS, QUANTITY_KINDS, UNITS, kindOfUnit, unitLabel, type QuantityKind } from '@/shared/units';
import type { TipTapNode } from '@/shared/rich-text/extensions';
import { Button } from '@/components/ui/button';
import { inputClass } from '@/components/ui/field';
import { RichTextEditor } from '@/components/rich-text/rich-text-editor';
import { StepKindBadge } from './step-kind';
import { formatDate } from '@/lib/format';

type Step = DraftStep;
type Kind = Step['kind'];

function Field({ label, children, hint }: { label: string; children: (id: string) => ReactNode; hint?: string }) {
  const id = useId();
  return (
    <div>
      <label htmlFor={id} className="mb-1 block text-sm font-semibold">
        {label}
      </label>
      {children(id)}
      {hint ? <p className="mt-1 text-xs text-ink-soft">{hint}</p> : null}
    </div>
  );
}

export interface StepFormProps {
  step: Step;
  steps: Step[];
  isStart: boolean;
  problems: GuideProblem[];
  causes: { code: string; label: string }[];
  articles: { id: number; title: string }[];
  flags: { id: number; comment: string; userName: string | null; createdAt: string }[];
  onChange: (step: Step, key?: string) => void;
  onKind: (kind: Kind) => void;
  /** Adds a new step and applies `withTarget(newId)` to this step in the same edit. */
  onNewTarget: (withTarget: (id: string) => Step) => void;
  onMakeStart: () => void;
  onDelete: () => void;
  upload: (file: File) => Promise<string>;
}

export function StepForm(props: StepFormProps) {
  const { step, steps, onChange } = props;
  const set = (patch: Partial<Step>, key?: string) => onChange({ ...step, ...patch } as Step, key ? `${step.id}.${key}` : undefined);
  const others = steps.filter((s) => s.id !== step.id);

  // Called as a function, not rendered as a component, so the select keeps its identity between renders.
  // `pick` says how the step changes for a target; a new target step is created in the same edit.
  function renderNext({ value, pick, label, allowEnd }: { value: string | null; pick: (v: string | null) => Partial<Step>; label: string; allowEnd?: string }) {
    return (
      <select
        aria-label={label}
        className={inputClass}
        value={value === null ? '__end' : value}
        onChange={(e) => {
          const v = e.target.value;
          if (v === '__new') props.onNewTarget((id) => ({ ...step, ...pick(id) }) as Step);
          else set(pick(v === '__end' ? null : v));
        }}
      >
        <option value="">— choose the next step —</option>
        {allowEnd ? <option value="__end">{allowEnd}</option> : null}
        {others.map((s) => (
          <option key={s.id} value={s.id}>
            {STEP_KIND_LABELS[s.kind]}: {s.title || s.id}
          </option>
        ))}
        <option value="__new">+ A new step</option>
      </select>
    );
  }

  return (
    <div className="space-y-5" data-step-form={step.id}>
      <div className="flex flex-wrap items-center gap-2">
        <StepKindBadge kind={step.kind} />
        <span className="text-sm text-ink-soft">Step {step.id}</span>
        {props.isStart ? (
          <span className="rounded bg-paper-sunk px-1.5 text-xs">start</span>
        ) : (
          <Button variant="quiet" className="!min-h-9 text-sm" onClick={props.onMakeStart}>
            Make this the start
          </Button>
        )}
        <Button variant="quiet" className="!min-h-9 ml-auto text-sm text-danger" onClick={() => window.confirm('Delete this step?') && props.onDelete()}>
          Delete step
        </Button>
      </div>
      {props.problems.length ? (
        <ul className="space-y-1 rounded-md border-l-4 border-danger bg-danger-wash px-3 py-2 text-sm" aria-label="To fix in this step">
          {props.problems.map((p, i) => (
            <li key={i}>{p.message}</li>
          ))}
        </ul>
      ) : null}
      {props.flags.length ? (
        <div className="rounded-md border-l-4 border-amber-line bg-amber-wash px-3 py-2 text-sm">
          <p className="font-semibold">Technicians flagged this step</p>
          <ul className="mt-1 space-y-1">
            {props.flags.map((f) => (
              <li key={f.id}>
                “{f.comment}” — {f.userName ?? 'someone'}, {formatDate(f.createdAt)}
              </li>
            ))}
          </ul>
        </div>
      ) : null}

      <fieldset>
        <legend className="mb-1 text-sm font-semibold">Kind of step</legend>
        <div className="flex flex-wrap gap-1">
          {STEP_KINDS.map((k) => (
            <button
              key={k}
              type="button"
              aria-pressed={step.kind === k}
              onClick={() => props.onKind(k)}
              className={`min-h-11 rounded-md border px-2 ${step.kind === k ? 'border-amber bg-amber-wash' : 'border-rule-strong bg-paper-raised'}`}
            >
              <StepKindBadge kind={k} />
            </button>
          ))}
        </div>
      </fieldset>

      <Field
        label={
          step.kind === 'ask'
            ? 'Question'
            : step.kind === 'measure'
              ? 'What to measure'
              : step.kind === 'try'
                ? 'What to try (short)'
                : step.kind === 'finding'
                  ? 'Finding (short)'
                  : 'Hand-off (short)'
        }
      >
        {(id) => <input id={id} className={inputClass} value={step.title} maxLength={200} onChange={(e) => set({ title: e.target.value }, 'title')} />}
      </Field>

      {step.kind === 'ask' ? (
        <fieldset className="space-y-2">
          <legend className="text-sm font-semibold">Answers</legend>
          {step.choices.map((c, i) => (
            <div key={c.id} className="grid grid-cols-[1fr_1fr_auto] gap-2">
              <input
                aria-label={`Answer ${i + 1}`}
                className={inputClass}
                value={c.label}
                onChange={(e) => set({ choices: step.choices.map((x, k) => (k === i ? { ...x, label: e.target.value } : x)) }, `choice.${i}`)}
              />
              {renderNext({
                label: `Next step after “${c.label || `answer ${i + 1}`}”`,
                value: c.next,
                pick: (v) => ({ choices: step.choices.map((x, k) => (k === i ? { ...x, next: v ?? '' } : x)) }),
              })}
              <Button variant="quiet" aria-label={`Remove answer ${i + 1}`} onClick={() => set({ choices: step.choices.filter((_, k) => k !== i) })}>
                ✕
              </Button>
            </div>
          ))}
          <Button
            variant="secondary"
            onClick={() =>
              set({
                choices: [
                  ...step.choices,
                  {
                    id: freshId(
                      'c',
                      step.choices.map((x) => x.id),
                    ),
                    label: '',
                    next: '',
                  },
                ],
              })
            }
          >
            Add an answer
          </Button>
        </fieldset>
      ) : null}

      {step.kind === 'measure' ? <MeasureFields step={step} set={set} renderNext={renderNext} /> : null}

      {step.kind === 'try' ? (
        <>
          <Field label="What to do">{(id) => <textarea id={id} className={inputClass} rows={3} value={step.action} onChange={(e) => set({ action: e.target.value }, 'action')} />}</Field>
          <div className="grid gap-3 sm:grid-cols-2">
            <Field label="When it fixed the fault">
              {() => renderNext({ label: 'Next step when fixed', value: step.fixedNext, allowEnd: 'The walk ends: fixed', pick: (v) => ({ fixedNext: v }) })}
            </Field>
            <Field label="When it did not">{() => renderNext({ label: 'Next step when not fixed', value: step.notFixedNext, pick: (v) => ({ notFixedNext: v ?? '' }) })}</Field>
          </div>
        </>
      ) : null}

      {step.kind === 'finding' ? (
        <>
          <Field label="Cause (for counting across guides)">
            {(id) => (
              <select id={id} className={inputClass} value={step.causeCode} onChange={(e) => set({ causeCode: e.target.value })}>
                <option value="">— choose a cause —</option>
                {props.causes.map((c) => (
                  <option key={c.code} value={c.code}>
                    {c.label}
                  </option>
                ))}
              </select>
            )}
          </Field>
          <Field label="Probable cause, in words">{(id) => <textarea id={id} className={inputClass} rows={2} value={step.cause} onChange={(e) => set({ cause: e.target.value }, 'cause')} />}</Field>
          <Field label="Remedy, one step per line" hint="Shown as a checklist to tick off on site.">
            {(id) => <textarea id={id} className={inputClass} rows={5} value={step.remedy.join('\n')} onChange={(e) => set({ remedy: e.target.value.split('\n') }, 'remedy')} />}
          </Field>
          <fieldset className="space-y-2">
            <legend className="text-sm font-semibold">Parts to have ready</legend>
            {step.parts.map((p, i) => (
              <div key={i} className="grid grid-cols-[2fr_1fr_5rem_auto] gap-2">
                <input
                  aria-label={`Part ${i + 1} name`}
                  className={inputClass}
                  value={p.name}
                  onChange={(e) => set({ parts: step.parts.map((x, k) => (k === i ? { ...x, name: e.target.value } : x)) }, `part.${i}`)}
                />
                <input
                  aria-label={`Part ${i + 1} number`}
                  className={inputClass}
                  placeholder="Part no."
                  value={p.partNumber ?? ''}
                  onChange={(e) => set({ parts: step.parts.map((x, k) => (k === i ? { ...x, partNumber: e.target.value || undefined } : x)) }, `partno.${i}`)}
                />
                <input
                  aria-label={`Part ${i + 1} quantity`}
                  className={inputClass}
                  type="number"
                  min={1}
                  value={p.quantity}
                  onChange={(e) => set({ parts: step.parts.map((x, k) => (k === i ? { ...x, quantity: Math.max(1, Number(e.target.value) || 1) } : x)) })}
                />
                <Button variant="quiet" aria-label={`Remove part ${i + 1}`} onClick={() => set({ parts: step.parts.filter((_, k) => k !== i) })}>
                  ✕
                </Button>
              </div>
            ))}
            <Button variant="secondary" onClick={() => set({ parts: [...step.parts, { name: '', quantity: 1 }] })}>
              Add a part
            </Button>
          </fieldset>
          <Field label="Typical time (minutes)">
            {(id) => (
              <input
                id={id}
                type="number"
                min={1}
                className={`${inputClass} w-32`}
                value={step.typicalMinutes ?? ''}
                onChange={(e) => set({ typicalMinutes: e.target.value ? Math.round(Number(e.target.value)) : undefined })}
              />
            )}
          </Field>
        </>
      ) : null}

      {step.kind === 'handoff' ? (
        <>
          <Field label="Whom to call">{(id) => <input id={id} className={inputClass} value={step.contact} onChange={(e) => set({ contact: e.target.value }, 'contact')} />}</Field>
          <Field label="What to tell them">{(id) => <textarea id={id} className={inputClass} rows={3} value={step.message} onChange={(e) => set({ message: e.target.value }, 'message')} />}</Field>
        </>
      ) : null}

      <fieldset className="space-y-3">
        <legend className="text-sm font-semibold">Cautions (acknowledged before the step can be answered)</legend>
        {step.cautions.map((c, i) => (
          <div key={c.id} className="space-y-2 rounded-md border-2 border-l-8 border-danger bg-danger-wash p-3">
            <div className="flex gap-2">
              <select
                aria-label={`Caution ${i + 1} hazard`}
                className={inputClass}
                value={c.hazard}
                onChange={(e) => set({ cautions: step.cautions.map((x, k) => (k === i ? { ...x, hazard: e.target.value as Hazard } : x)) })}
              >
                {HAZARD_KEYS.map((h) => (
                  <option key={h} value={h}>
                    {HAZARDS[h]}
                  </option>
                ))}
              </select>
              <Button variant="quiet" aria-label={`Remove caution ${i + 1}`} onClick={() => set({ cautions: step.cautions.filter((_, k) => k !== i) })}>
                ✕
              </Button>
            </div>
            <textarea
              aria-label={`Caution ${i + 1}: the danger`}
              placeholder="The danger, e.g. fluid at 60 bar can inject through skin"
              className={inputClass}
              rows={2}
              value={c.text}
              onChange={(e) => set({ cautions: step.cautions.map((x, k) => (k === i ? { ...x, text: e.target.value } : x)) }, `caution.${i}.text`)}
            />
            <textarea
              aria-label={`Caution ${i + 1}: what to do`}
              placeholder="What to do first, e.g. lock out the pump and open the relief valve"
              className={inputClass}
              rows={2}
              value={c.action}
              onChange={(e) => set({ cautions: step.cautions.map((x, k) => (k === i ? { ...x, action: e.target.value } : x)) }, `caution.${i}.action`)}
            />
          </div>
        ))}
        <Button
          variant="secondary"
          onClick={() =>
            set({
              cautions: [
                ...step.cautions,
                {
                  id: freshId(
                    'k',
                    step.cautions.map((x) => x.id),
                  ),
                  hazard: 'fluid-pressure',
                  text: '',
                  action: '',
                },
              ],
            })
          }
        >
          Add a caution
        </Button>
      </fieldset>

      <Field label="Linked articles">
        {(id) => (
          <select
            id={id}
            multiple
            className={`${inputClass} h-28`}
            value={step.articleIds.map(String)}
            onChange={(e) => set({ articleIds: Array.from(e.target.selectedOptions).map((o) => Number(o.value)) })}
          >
            {props.articles.map((a) => (
              <option key={a.id} value={a.id}>
                {a.title}
              </option>
            ))}
          </select>
        )}
      </Field>

      <div>
        <p className="mb-1 text-sm font-semibold">More detail and photos (optional)</p>
        <RichTextEditor
          key={step.id}
          label={`Detail of step ${step.id}`}
          value={(step.body?.doc as TipTapNode | undefined) ?? { type: 'doc', content: [{ type: 'paragraph' }] }}
          onChange={(doc) => set({ body: { doc: doc as never } }, 'body')}
          upload={props.upload}
        />
      </div>
    </div>
  );
}

function freshId(prefix: string, taken: string[]): string {
  for (let n = 1; ; n++) if (!taken.includes(`${prefix}${n}`)) return `${prefix}${n}`;
}

type MeasureStep = Extract<Step, { kind: 'measure' }>;

function MeasureFields({
  step,
  set,
  renderNext,
}: {
  step: MeasureStep;
  set: (patch: Partial<Step>, key?: string) => void;
  renderNext: (p: { value: string | null; pick: (v: string | null) => Partial<Step>; label: string }) => React.JSX.Element;
}) {
  const calculators = listCalculators();
  const calc = calculators.find((c) => c.id === step.calculator?.id);
  const output = calc?.outputs.find((o) => o.name === step.calculator?.output);
  const bandKind = (output && output.kind !== 'verdict' && output.kind !== 'any' ? output.kind : step.reading.kind) as QuantityKind;
  const bandUnits = UNITS[bandKind] ?? [];
  const num = (v: string) => (v.trim() === '' ? null : Number(v));
  return (
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Reading label">
          {(id) => (
            <input
              id={id}
              className={inputClass}
              value={step.reading.label}
              placeholder="Coil resistance"
              onChange={(e) => set({ reading: { ...step.reading, label: e.target.value } }, 'reading.label')}
            />
          )}
        </Field>
        <Field label="Quantity">
          {(id) => (
            <select
              id={id}
              className={inputClass}
              value={step.reading.kind}
              onChange={(e) => {
                const kind = e.target.value as QuantityKind;
                const unit = UNITS[kind][0].unit;
                set({ reading: { ...step.reading, kind, unit }, ...(step.calculator ? {} : { bandUnit: unit }) });
              }}
            >
              {QUANTITY_KINDS.map((k) => (
                <option key={k} value={k}>
                  {KIND_LABELS[k]}
                </option>
              ))}
            </select>
          )}
        </Field>
        <Field label="Unit asked for">
          {(id) => (
            <select
              id={id}
              className={inputClass}
              value={step.reading.unit}
              onChange={(e) => set({ reading: { ...step.reading, unit: e.target.value }, ...(step.calculator ? {} : { bandUnit: e.target.value }) })}
            >
              {UNITS[step.reading.kind].map((u) => (
                <option key={u.unit} value={u.unit}>
                  {u.label || u.unit}
                </option>
              ))}
            </select>
          )}
        </Field>
      </div>
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Work it out with" hint="Route on a calculator result instead of the raw reading.">
          {(id) => (
            <select
              id={id}
              className={inputClass}
              value={step.calculator?.id ?? ''}
              onChange={(e) => {
                const c = calculators.find((x) => x.id === e.target.value);
                if (!c) return set({ calculator: undefined, bandUnit: step.reading.unit });
                const out = c.outputs.find((o) => o.kind !== 'verdict') ?? c.outputs[0];
                const readingInput = c.inputs.find((i) => i.kind === step.reading.kind)?.name;
                set({ calculator: { id: c.id, readingInput, fixedInputs: {}, output: out.name }, bandUnit: out.unit ?? 'ohm' });
              }}
            >
              <option value="">The reading itself</option>
              {calculators.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.title}
                </option>
              ))}
            </select>
          )}
        </Field>
        {calc ? (
          <>
            <Field label="The reading fills">
              {(id) => (
                <select
                  id={id}
                  className={inputClass}
                  value={step.calculator?.readingInput ?? ''}
                  onChange={(e) => set({ calculator: { ...step.calculator!, readingInput: e.target.value || undefined } })}
                >
                  <option value="">(nothing: only recorded)</option>
                  {calc.inputs.map((i) => (
                    <option key={i.name} value={i.name}>
                      {i.label}
                    </option>
                  ))}
                </select>
              )}
            </Field>
            <Field label="Route on">
              {(id) => (
                <select
                  id={id}
                  className={inputClass}
                  value={step.calculator?.output ?? ''}
                  onChange={(e) => {
                    const o = calc.outputs.find((x) => x.name === e.target.value);
                    set({ calculator: { ...step.calculator!, output: e.target.value }, bandUnit: o?.unit ?? step.bandUnit });
                  }}
                >
                  {calc.outputs
                    .filter((o) => o.kind !== 'verdict')
                    .map((o) => (
                      <option key={o.name} value={o.name}>
                        {o.label}
                      </option>
                    ))}
                </select>
              )}
            </Field>
          </>
        ) : null}
      </div>
      {calc ? (
        <fieldset className="rounded-md border border-rule p-3">
          <legend className="px-1 text-sm font-semibold">Known values the technician need not type</legend>
          <div className="grid gap-2 sm:grid-cols-2">
            {calc.inputs
              .filter((i) => i.name !== step.calculator?.readingInput && i.kind !== 'list' && i.kind !== 'any' && i.kind !== 'unit')
              .map((i) => {
                const fixed = step.calculator?.fixedInputs[i.name];
                const setFixed = (v: { value: number; unit: string } | string | undefined) => {
                  const next = { ...step.calculator!.fixedInputs };
                  if (v === undefined) delete next[i.name];
                  else next[i.name] = v;
                  set({ calculator: { ...step.calculator!, fixedInputs: next } }, `fixed.${i.name}`);
                };
                if (i.kind === 'choice') {
                  return (
                    <label key={i.name} className="text-sm">
                      {i.label}
                      <select className={inputClass} value={typeof fixed === 'string' ? fixed : ''} onChange={(e) => setFixed(e.target.value || undefined)}>
                        <option value="">Asked on site</option>
                        {i.choices?.map((c) => (
                          <option key={c.value} value={c.value}>
                            {c.label}
                          </option>
                        ))}
                      </select>
                    </label>
                  );
                }
                const q = typeof fixed === 'object' ? fixed : undefined;
                const unit = q?.unit ?? i.defaultUnit ?? UNITS[i.kind as QuantityKind]?.[0]?.unit ?? '';
                return (
                  <label key={i.name} className="text-sm">
                    {i.label}
                    <span className="flex gap-1">
                      <input
                        className={inputClass}
                        inputMode="decimal"
                        placeholder="Asked on site"
                        value={q ? String(q.value) : ''}
                        onChange={(e) => setFixed(e.target.value.trim() === '' || !Number.isFinite(Number(e.target.value)) ? undefined : { value: Number(e.target.value), unit })}
                      />
                      <span className="flex min-w-10 items-center text-ink-soft">{unitLabel(unit, kindOfUnit(unit))}</span>
                    </span>
                  </label>
                );
              })}
          </div>
        </fieldset>
      ) : null}
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold">
          Bands in{' '}
          <select aria-label="Band unit" className="rounded border border-rule-strong bg-paper-raised px-1" value={step.bandUnit} onChange={(e) => set({ bandUnit: e.target.value })}>
            {bandUnits.map((u) => (
              <option key={u.unit} value={u.unit}>
                {u.label || u.unit}
              </option>
            ))}
          </select>{' '}
          (empty limit = no limit; together they must cover every value once)
        </legend>
        {step.bands.map((b, i) => {
          const put = (patch: Partial<typeof b>, key?: string) => set({ bands: step.bands.map((x, k) => (k === i ? { ...x, ...patch } : x)) }, key);
          return (
            <div key={b.id} className="space-y-2 rounded-md border border-rule p-2">
              <div className="grid grid-cols-[1fr_auto] gap-2">
                <input aria-label={`Band ${i + 1} name`} className={inputClass} value={b.label} onChange={(e) => put({ label: e.target.value }, `band.${i}.label`)} />
                <Button variant="quiet" aria-label={`Remove band ${i + 1}`} onClick={() => set({ bands: step.bands.filter((_, k) => k !== i) })}>
                  ✕
                </Button>
              </div>
              <div className="flex flex-wrap items-center gap-2 text-sm">
                <label className="flex items-center gap-1">
                  <input type="checkbox" checked={b.minInclusive} onChange={(e) => put({ minInclusive: e.target.checked })} /> from (incl.)
                </label>
                <input
                  aria-label={`Band ${i + 1} lower limit`}
                  className={`${inputClass} w-28`}
                  inputMode="decimal"
                  value={b.min ?? ''}
                  placeholder="−∞"
                  onChange={(e) => put({ min: num(e.target.value) }, `band.${i}.min`)}
                />
                <span>to</span>
                <input
                  aria-label={`Band ${i + 1} upper limit`}
                  className={`${inputClass} w-28`}
                  inputMode="decimal"
                  value={b.max ?? ''}
                  placeholder="+∞"
                  onChange={(e) => put({ max: num(e.target.value) }, `band.${i}.max`)}
                />
                <label className="flex items-center gap-1">
                  <input type="checkbox" checked={b.maxInclusive} onChange={(e) => put({ maxInclusive: e.target.checked })} /> (incl.)
                </label>
                <span className="text-ink-soft">{describeBand(b, step.bandUnit)}</span>
              </div>
              {renderNext({ label: `Next step for band “${b.label || i + 1}”`, value: b.next, pick: (v) => ({ bands: step.bands.map((x, k) => (k === i ? { ...x, next: v ?? '' } : x)) }) })}
            </div>
          );
        })}
        <Button
          variant="secondary"
          onClick={() =>
            set({
              bands: [
                ...step.bands,
                {
                  id: freshId(
                    'b',
                    step.bands.map((x) => x.id),
                  ),
                  label: '',
                  min: null,
                  max: null,
                  minInclusive: false,
                  maxInclusive: false,
                  next: '',
                },
              ],
            })
          }
        >
          Add a band
        </Button>
      </fieldset>
    </div>
  );
}
