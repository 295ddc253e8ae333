// The output side: values with units (each switchable), warnings beside them, nothing hidden.
import type { CalculatorDeclaration, CalculatorResponse } from '@/shared/calculators/types';
import { UNITS, kindOfUnit, unitLabel, type QuantityKind } from '@/shared/units';
import { Icon } from '@/components/ui/icons';
import { formatNumber } from '@/lib/format';

export function formatValue(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  if (v === 0) return '0';
  const abs = Math.abs(v);
  if (abs >= 1e7 || abs < 1e-4) return v.toExponential(4).replace('e+', ' × 10^').replace('e-', ' × 10^-');
  return formatNumber(Number(v.toPrecision(6)), { maximumFractionDigits: 6 });
}

const VERDICT_WORDS: Record<string, { text: string; tone: 'ok' | 'bad' | 'neutral' }> = {
  ok: { text: 'OK', tone: 'ok' },
  low: { text: 'Low: shorted turns likely', tone: 'bad' },
  high: { text: 'High: check connections and coil', tone: 'bad' },
  open: { text: 'Open circuit', tone: 'bad' },
  overdue: { text: 'Overdue', tone: 'bad' },
  'no-forecast': { text: 'No forecast (the valve does not run)', tone: 'neutral' },
};

export function CalculatorResults({
  calc,
  result,
  outputUnits,
  onOutputUnit,
}: {
  calc: CalculatorDeclaration;
  result: CalculatorResponse;
  outputUnits: Record<string, string>;
  onOutputUnit: (name: string, unit: string) => void;
}) {
  return (
    <div className="space-y-3">
      <dl className="divide-y divide-rule rounded-lg border border-rule bg-paper-raised" aria-live="polite">
        {calc.outputs.map((o) => {
          const v = result.outputs[o.name];
          if (v === undefined) return null;
          if (typeof v === 'string') {
            const word = VERDICT_WORDS[v] ?? { text: v, tone: 'neutral' as const };
            return (
              <div key={o.name} className="flex flex-wrap items-center justify-between gap-2 px-4 py-3">
                <dt className="text-ink-soft">{o.label}</dt>
                <dd
                  data-output={o.name}
                  className={`rounded px-2 py-1 font-semibold ${word.tone === 'ok' ? 'bg-fixed-wash text-fixed' : word.tone === 'bad' ? 'bg-danger-wash text-danger-deep' : 'bg-paper-sunk'}`}
                >
                  {word.text}
                </dd>
              </div>
            );
          }
          const kind = (o.kind === 'any' || o.kind === 'verdict' ? kindOfUnit(v.unit) : o.kind) as QuantityKind | undefined;
          const units = kind ? UNITS[kind] : [];
          return (
            <div key={o.name} className="flex flex-wrap items-center justify-between gap-2 px-4 py-3">
              <dt className="text-ink-soft">{o.label}</dt>
              <dd className="flex items-center gap-2">
                <span data-output={o.name} className="tabular text-lg font-semibold">
                  {formatValue(v.value)}
                </span>
                {units.length > 1 && o.kind !== 'any' ? (
                  <select
                    aria-label={`Show ${o.label.toLowerCase()} in`}
                    className="min-h-11 rounded-md border border-rule-strong bg-paper px-2"
                    value={outputUnits[o.name] ?? v.unit}
                    onChange={(e) => onOutputUnit(o.name, e.target.value)}
                  >
                    {units.map((s) => (
                      <option key={s.unit} value={s.unit}>
                        {s.label || s.unit}
                      </option>
                    ))}
                  </select>
                ) : (
                  <span className="text-ink-soft">{unitLabel(v.unit, kind)}</span>
                )}
              </dd>
            </div>
          );
        })}
      </dl>
      {result.warnings.length ? (
        <ul className="space-y-2" aria-label="Warnings">
          {result.warnings.map((w) => (
            <li key={w.code} data-warning={w.code} className="flex gap-2 rounded-md border-l-4 border-amber-line bg-amber-wash px-3 py-2 text-sm text-ink">
              <Icon.warning className="mt-0.5 shrink-0 text-amber-deep" />
              <span>{w.message}</span>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

export function resultText(calc: CalculatorDeclaration, result: CalculatorResponse, link: string): string {
  const lines = [calc.title];
  for (const o of calc.outputs) {
    const v = result.outputs[o.name];
    if (v === undefined) continue;
    lines.push(typeof v === 'string' ? `${o.label}: ${v}` : `${o.label}: ${formatValue(v.value)} ${unitLabel(v.unit)}`.trim());
  }
  for (const w of result.warnings) lines.push(`Warning: ${w.message}`);
  lines.push(link);
  return lines.join('\n');
}
