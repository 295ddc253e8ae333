// The input side of a calculator: one row per input with its unit picker. Reused inline by guides.
import { useId } from 'react';
import type { CalculatorDeclaration, InputDeclaration } from '@/shared/calculators/types';
import { KIND_LABELS, QUANTITY_KINDS, UNITS, kindOfUnit, unitLabel, type QuantityKind, type UnitSystem } from '@/shared/units';
import { inputClass } from '@/components/ui/field';
import { inputKind, unitChoices, type FieldState, type FormState } from './form-state';

function UnitSelect({ decl, value, system, onChange, label }: { decl: InputDeclaration; value: string; system: UnitSystem; onChange: (u: string) => void; label: string }) {
  if (decl.kind === 'any') {
    return (
      <select aria-label={label} className={`${inputClass} w-auto min-w-24`} value={value} onChange={(e) => onChange(e.target.value)}>
        {QUANTITY_KINDS.filter((k) => k !== 'temperatureDifference').map((k) => (
          <optgroup key={k} label={KIND_LABELS[k]}>
            {UNITS[k].map((s) => (
              <option key={`${k}-${s.unit}`} value={s.unit} disabled={kindOfUnit(s.unit) !== k}>
                {s.label || s.unit}
              </option>
            ))}
          </optgroup>
        ))}
      </select>
    );
  }
  const units = unitChoices(decl, system);
  const kind = inputKind(decl) as QuantityKind;
  if (units.length <= 1) {
    const only = units[0] ?? '';
    const text = unitLabel(only, kind);
    return text ? <span className="inline-flex min-h-11 min-w-12 items-center px-2 text-ink-soft">{text}</span> : null;
  }
  return (
    <select aria-label={label} className={`${inputClass} w-auto min-w-24`} value={value} onChange={(e) => onChange(e.target.value)}>
      {units.map((u) => (
        <option key={u} value={u}>
          {unitLabel(u, kindOfUnit(u) === kind ? kind : undefined)}
        </option>
      ))}
    </select>
  );
}

function Row({
  decl,
  field,
  error,
  system,
  onChange,
  fixed,
  toKind,
}: {
  decl: InputDeclaration;
  field: FieldState;
  error?: string;
  system: UnitSystem;
  onChange: (f: FieldState) => void;
  fixed?: boolean;
  toKind?: QuantityKind;
}) {
  const id = useId();
  const describedBy = [error ? `${id}-err` : '', `${id}-help`].filter(Boolean).join(' ');
  const optionalNote = decl.optional
    ? decl.default !== undefined
      ? ` (optional, default ${decl.default}${decl.defaultUnit && decl.defaultUnit !== '1' ? ' ' + unitLabel(decl.defaultUnit) : ''})`
      : ' (optional)'
    : '';

  let control;
  if (decl.kind === 'choice') {
    control = (
      <div role="radiogroup" aria-labelledby={`${id}-label`} className="flex flex-wrap gap-2">
        {decl.choices?.map((c) => (
          <label
            key={c.value}
            className={`flex min-h-11 cursor-pointer items-center gap-2 rounded-md border px-3 ${field.text === c.value ? 'border-amber bg-amber-wash font-semibold' : 'border-rule-strong bg-paper-raised'}`}
          >
            <input
              type="radio"
              className="size-4 accent-[#9C5700]"
              name={`${id}-${decl.name}`}
              value={c.value}
              checked={field.text === c.value}
              disabled={fixed}
              onChange={() => onChange({ ...field, text: c.value })}
            />
            {c.label}
          </label>
        ))}
      </div>
    );
  } else if (decl.kind === 'unit') {
    const kind = toKind;
    control = (
      <select
        id={id}
        aria-describedby={describedBy}
        aria-invalid={error ? true : undefined}
        className={inputClass}
        value={field.text}
        disabled={fixed}
        onChange={(e) => onChange({ ...field, text: e.target.value })}
      >
        {(kind ? UNITS[kind] : []).map((s) => (
          <option key={s.unit} value={s.unit}>
            {s.label || s.unit}
          </option>
        ))}
      </select>
    );
  } else {
    control = (
      <div className="flex gap-2">
        <input
          id={id}
          className={inputClass + ' tabular'}
          inputMode={decl.kind === 'list' ? 'text' : 'decimal'}
          autoComplete="off"
          placeholder={decl.kind === 'list' ? 'e.g. 54, 187, 216' : decl.default !== undefined ? String(decl.default) : ''}
          value={field.text}
          readOnly={fixed}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          onChange={(e) => onChange({ ...field, text: e.target.value })}
        />
        <UnitSelect decl={decl} system={system} value={field.unit} label={`Unit of ${decl.label.toLowerCase()}`} onChange={(unit) => onChange({ ...field, unit })} />
      </div>
    );
  }

  return (
    <div>
      <label id={`${id}-label`} htmlFor={decl.kind === 'choice' ? undefined : id} className="mb-1 block text-sm font-semibold">
        {decl.label}
        <span className="font-normal text-ink-soft">{optionalNote}</span>
      </label>
      {control}
      {error ? (
        <p id={`${id}-err`} className="mt-1 text-sm font-semibold text-danger">
          {error}
        </p>
      ) : null}
      <p id={`${id}-help`} className="mt-1 text-sm text-ink-soft">
        {decl.help}
      </p>
    </div>
  );
}

export function CalculatorFields({
  calc,
  state,
  system,
  errors,
  onChange,
  fixed = [],
}: {
  calc: CalculatorDeclaration;
  state: FormState;
  system: UnitSystem;
  errors: Record<string, string>;
  onChange: (next: FormState) => void;
  fixed?: string[];
}) {
  const valueUnit = state.value?.unit;
  const toKind = valueUnit ? kindOfUnit(valueUnit) : undefined;
  return (
    <div className="space-y-4">
      {calc.inputs.map((d) => (
        <Row
          key={d.name}
          decl={d}
          field={state[d.name] ?? { text: '', unit: '' }}
          error={errors[d.name]}
          system={system}
          fixed={fixed.includes(d.name)}
          toKind={toKind}
          onChange={(f) => {
            const next = { ...state, [d.name]: f };
            // Unit converter: keep the target unit within the kind of the value's unit.
            if (calc.id === 'unit-convert' && d.name === 'value' && f.unit !== state.value?.unit) {
              const k = kindOfUnit(f.unit);
              if (k && !UNITS[k].some((s) => s.unit === next.to?.text)) next.to = { text: UNITS[k].find((s) => s.unit !== f.unit)?.unit ?? f.unit, unit: '' };
            }
            onChange(next);
          }}
        />
      ))}
    </div>
  );
}
