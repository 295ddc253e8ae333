// One calculator: inputs, live results and warnings, formula and references, copy and share.
import { useEffect, useMemo, useState } from 'react';
import { Link, useParams, useSearchParams } from 'react-router';
import { listCalculators } from '@/shared/calculators';
import type { CalculatorDeclaration } from '@/shared/calculators/types';
import { useMe } from '@/lib/auth';
import { paths } from '@/lib/paths';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/feedback';
import { Icon } from '@/components/ui/icons';
import { Card } from '@/components/ui/page';
import { NotFoundPage } from '@/components/errors/route-error';
import { useCalculation } from '@/components/calculator/use-calculation';
import { fromSearch, initialState, toSearch, type FormState } from '@/components/calculator/form-state';
import { CalculatorFields } from '@/components/calculator/calculator-fields';
import { CalculatorResults, resultText } from '@/components/calculator/calculator-results';
import { ReferenceList } from './reference-list';

export function CalculatorPage() {
  const { id } = useParams();
  const calc = useMemo(() => listCalculators().find((c) => c.id === id), [id]);
  if (!calc) return <NotFoundPage />;
  return <CalculatorView key={calc.id} calc={calc} />;
}

function CalculatorView({ calc }: { calc: CalculatorDeclaration }) {
  const { data: me } = useMe();
  const system = me?.user.unitSystem ?? 'metric';
  const [params, setParams] = useSearchParams();
  const [initial] = useState(() => fromSearch(calc, params, initialState(calc, system)));
  const [state, setState] = useState<FormState>(initial.state);
  const [outputUnits, setOutputUnits] = useState<Record<string, string>>(initial.outputUnits);
  const calculation = useCalculation(calc, state, outputUnits);

  useEffect(() => {
    setParams(toSearch(calc, state, outputUnits), { replace: true });
  }, [calc, state, outputUnits, setParams]);

  const link = typeof window === 'undefined' ? '' : window.location.href;
  const copy = (text: string, what: string) =>
    navigator.clipboard
      ? navigator.clipboard.writeText(text).then(
          () => showToast(`${what} copied`, 'ok'),
          () => showToast(`Could not copy the ${what.toLowerCase()}: select and copy it by hand`, 'error'),
        )
      : showToast('Copying is not available in this browser', 'error');

  return (
    <div>
      <nav className="mb-3 text-sm">
        <Link to={paths.calculators} className="inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
          All calculators
        </Link>
      </nav>
      <div className="mb-6 border-b border-rule pb-4">
        <h1 className="text-2xl font-semibold sm:text-3xl">{calc.title}</h1>
        <p className="mt-1 max-w-prose text-ink-soft">{calc.summary}</p>
      </div>
      <div className="grid gap-6 lg:grid-cols-2">
        <Card>
          <h2 className="sr-only">Inputs</h2>
          <CalculatorFields calc={calc} state={state} system={system} errors={calculation.fieldErrors} onChange={setState} />
          <div className="mt-4">
            <Button variant="secondary" onClick={() => setState(initialState(calc, system))}>
              Clear
            </Button>
          </div>
        </Card>
        <div className="space-y-4 lg:sticky lg:top-20 lg:self-start">
          <h2 className="text-xl font-semibold">Result</h2>
          {calculation.result ? (
            <>
              <CalculatorResults calc={calc} result={calculation.result} outputUnits={outputUnits} onOutputUnit={(name, unit) => setOutputUnits((o) => ({ ...o, [name]: unit }))} />
              <div className="flex flex-wrap gap-2">
                <Button variant="secondary" onClick={() => copy(resultText(calc, calculation.result!, link), 'Result')}>
                  <Icon.copy /> Copy result
                </Button>
                <Button variant="secondary" onClick={() => copy(link, 'Link')}>
                  <Icon.link /> Copy link
                </Button>
              </div>
            </>
          ) : calculation.missing.length ? (
            <Notice title="Fill in the inputs to see the result">Still needed: {calculation.missing.join(', ')}.</Notice>
          ) : (
            <Notice tone="error" title="Check the inputs">
              {calculation.formErrors.length ? calculation.formErrors.join(' ') : 'Correct the fields marked in red.'}
            </Notice>
          )}
          {calculation.result && calculation.formErrors.length ? <Notice tone="warn">{calculation.formErrors.join(' ')}</Notice> : null}
        </div>
      </div>
      <section className="mt-8 grid gap-6 lg:grid-cols-2" aria-label="How this is worked out">
        <Card>
          <h2 className="text-lg font-semibold">Formula</h2>
          <pre className="mt-2 whitespace-pre-wrap font-sans text-sm leading-relaxed">{calc.formula}</pre>
          {calc.limits.length ? (
            <>
              <h3 className="mt-4 font-semibold">Holds only when</h3>
              <ul className="mt-1 list-disc space-y-1 pl-5 text-sm">
                {calc.limits.map((l) => (
                  <li key={l}>{l}</li>
                ))}
              </ul>
            </>
          ) : null}
        </Card>
        <Card>
          <h2 className="text-lg font-semibold">References</h2>
          <ReferenceList references={calc.references} />
        </Card>
      </section>
    </div>
  );
}
