// A Measure step worked out with the step's calculator: the fixed and prefilled inputs, the
// technician's reading, the output that routes the walk and the band it falls in. Loaded lazily,
// it brings the calculators with it.
import { useMemo, useState } from 'react';
import { getCalculator, type Calculator } from '@/shared/calculators';
import type { Step } from '@/shared/guides/schema';
import type { RoutingAnswer } from '@/shared/walks/answers';
import { prefillFromApplicator, type ApplicatorSpecs } from '@/shared/walks/prefill';
import { STEP_CALCULATORS } from '@/shared/walks/walk-path';
import { unitLabel, type UnitSystem } from '@/shared/units';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/feedback';
import { CalculatorFields } from '@/components/calculator/calculator-fields';
import { initialState, type FormState } from '@/components/calculator/form-state';
import { useCalculation } from '@/components/calculator/use-calculation';
import { formatValue } from '@/components/calculator/calculator-results';
import { BandPreview, PlainMeasure, type Submit } from './step-views';

type Props = {
  step: Extract<Step, { kind: 'measure' }>;
  disabled: boolean;
  system: UnitSystem;
  submit: Submit;
  specs?: ApplicatorSpecs;
};

export function MeasureWithCalculator(props: Props) {
  const calc = getCalculator(props.step.calculator!.id);
  // A calculator this build does not know: the plain reading, which the server then judges.
  if (!calc) return <PlainMeasure step={props.step} disabled={props.disabled} system={props.system} submit={props.submit} calculators={STEP_CALCULATORS} />;
  return <CalculatorMeasure {...props} calc={calc} />;
}

function CalculatorMeasure({ step, disabled, system, submit, specs, calc }: Props & { calc: Calculator }) {
  const ref = step.calculator!;
  const fixedNames = Object.keys(ref.fixedInputs);
  const shown = useMemo(
    () => ({ ...calc, inputs: calc.inputs.filter((i) => !fixedNames.includes(i.name)).map((i) => (i.name === ref.readingInput ? { ...i, label: step.reading.label || i.label } : i)) }),
    [calc, fixedNames, ref.readingInput, step.reading.label],
  );
  const [state, setState] = useState<FormState>(() => {
    const s = initialState(calc, system);
    for (const [k, v] of Object.entries(ref.fixedInputs)) s[k] = typeof v === 'string' ? { text: v, unit: '' } : { text: String(v.value), unit: v.unit };
    if (specs) {
      const fill = prefillFromApplicator(
        specs,
        calc.inputs.filter((i) => !(i.name in ref.fixedInputs) && i.name !== ref.readingInput),
      );
      for (const [k, v] of Object.entries(fill)) s[k] = { text: String(v.value), unit: v.unit };
    }
    return s;
  });
  const prefilled = specs
    ? Object.entries(
        prefillFromApplicator(
          specs,
          calc.inputs.filter((i) => !(i.name in ref.fixedInputs) && i.name !== ref.readingInput),
        ),
      )
    : [];
  const [outputUnits] = useState<Record<string, string>>({ [ref.output]: step.bandUnit });
  const calcResult = useCalculation(calc, state, outputUnits);
  const [error, setError] = useState<string | null>(null);
  const out = calcResult.result?.outputs[ref.output];
  const readingField = ref.readingInput ? state[ref.readingInput] : undefined;
  const readingValue = readingField ? Number(readingField.text.replace(',', '.')) : NaN;
  const calculatorInputs = Object.fromEntries(Object.entries(calcResult.request).filter(([k]) => k !== ref.readingInput && !fixedNames.includes(k))) as Record<
    string,
    { value: number; unit: string } | string
  >;
  const tentative: RoutingAnswer | null =
    out && typeof out === 'object' && Number.isFinite(readingValue)
      ? { kind: 'reading', stepId: step.id, id: 'preview-0000', answeredAt: new Date().toISOString(), value: readingValue, unit: readingField!.unit, calculatorInputs, computed: out }
      : null;
  const outDecl = calc.outputs.find((o) => o.name === ref.output);
  return (
    <div className="space-y-4">
      <div className="rounded-md border border-rule bg-paper p-3">
        <p className="mb-2 text-sm font-semibold text-ink-soft">Worked out with: {calc.title}</p>
        {fixedNames.length ? (
          <p className="mb-3 text-sm text-ink-soft">
            Known:{' '}
            {fixedNames
              .map((n) => {
                const v = ref.fixedInputs[n];
                const d = calc.inputs.find((i) => i.name === n);
                return `${d?.label ?? n} ${typeof v === 'string' ? v : `${v.value} ${unitLabel(v.unit)}`}`;
              })
              .join(' · ')}
          </p>
        ) : null}
        {prefilled.length ? (
          <p className="mb-3 text-sm text-ink-soft" data-prefilled>
            From this valve’s record: {prefilled.map(([k, v]) => `${calc.inputs.find((i) => i.name === k)?.label ?? k} (${v.from})`).join(', ')}. Change them if the valve differs.
          </p>
        ) : null}
        <CalculatorFields calc={shown} state={state} system={system} errors={calcResult.fieldErrors} onChange={setState} />
      </div>
      {out && typeof out === 'object' ? (
        <p className="text-lg" data-output={ref.output}>
          {outDecl?.label ?? ref.output}: <span className="tabular font-semibold">{formatValue(out.value)}</span> {unitLabel(out.unit)}
        </p>
      ) : calcResult.missing.length ? (
        <p className="text-sm text-ink-soft">Still needed: {calcResult.missing.filter((m) => !fixedNames.some((n) => calc.inputs.find((i) => i.name === n)?.label === m)).join(', ')}</p>
      ) : null}
      {calcResult.result?.warnings.map((w) => (
        <p key={w.code} className="rounded border-l-4 border-amber-line bg-amber-wash px-3 py-1 text-sm">
          {w.message}
        </p>
      ))}
      <BandPreview step={step} answer={tentative} calculators={STEP_CALCULATORS} />
      {error ? <Notice tone="error" title={error} /> : null}
      <Button
        className="w-full !min-h-14 text-lg"
        disabled={disabled || !tentative}
        onClick={async () =>
          tentative &&
          tentative.kind === 'reading' &&
          setError(await submit({ kind: 'reading', stepId: step.id, value: tentative.value, unit: tentative.unit, calculatorInputs, computed: tentative.computed }))
        }
      >
        Use this reading
      </Button>
    </div>
  );
}
