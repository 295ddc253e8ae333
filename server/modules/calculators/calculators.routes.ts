// /api/calculators: the declarations, and one computation per call (pure, no database).
import { listCalculators, runCalculator } from '../../../src/shared/calculators';
import { CalculatorInputError, UnknownCalculatorError } from '../../../src/shared/calculators/types';
import { AppError } from '../../lib/app-error';
import { ApiRouter } from '../../lib/routes';

export function calculatorRoutes() {
  const r = new ApiRouter('/api/calculators');
  const declarations = listCalculators();

  r.get('/', 'calculators:use', (_req, res) => {
    res.json({ calculators: declarations });
  });

  r.get('/:id', 'calculators:use', (req, res) => {
    const calc = declarations.find((c) => c.id === req.params.id);
    if (!calc) throw AppError.notFound(`Calculator '${String(req.params.id).slice(0, 60)}'`);
    res.json({ calculator: calc });
  });

  r.post('/:id', 'calculators:use', (req, res) => {
    try {
      res.json(runCalculator(String(req.params.id), req.body));
    } catch (err) {
      if (err instanceof UnknownCalculatorError) throw AppError.notFound(`Calculator '${String(req.params.id).slice(0, 60)}'`);
      if (err instanceof CalculatorInputError) {
        const first = Object.values(err.fields)[0];
        throw AppError.invalid(first ?? err.message, err.fields);
      }
      throw err;
    }
  });

  return r;
}
