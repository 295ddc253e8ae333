// Guide validation on hand-made graphs: each rule that blocks submit and publish, the warnings,
// the band sweep (with generated partitions), the schemas' messages and the speed on 300 steps.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { listCalculators } from '@/shared/calculators';
import { DEFAULT_CAUSES } from '@/shared/tags';
import { SAMPLE_GUIDE } from '@/shared/guides/sample';
import { GUIDE_LIMITS, GuideContent, GuideDraftContent, type Band, type Caution, type Step } from '@/shared/guides/schema';
import { bandFor, bandProblems, describeBand, validateGuide, type GuideProblem } from '@/shared/guides/validate';

const ctx = { causeCodes: DEFAULT_CAUSES.map((cause) => cause.code), calculators: listCalculators() };
const none = { cautions: [] as Caution[], photoIds: [] as string[], articleIds: [] as number[] };

const lockOut: Caution = {
  id: 'lock-out',
  hazard: 'electrical',
  text: 'The driver can put up to 170 V DC on the coil.',
  action: 'Lock out and tag out the driver, then check the coil leads are dead.',
};

function band(id: string, min: number | null, max: number | null, minInclusive: boolean, maxInclusive: boolean, next: string): Band {
  return { id, label: `Band ${id}`, min, max, minInclusive, maxInclusive, next };
}

/**
 * An Ask, a Measure with three bands (coil resistance against the ±10 % window of a 28.8 Ω coil,
 * common practice when the maker gives no tolerance), a Try, two Findings and a Hand-off.
 */
function validGuide(): GuideContent {
  return structuredClone({
    startStepId: 'opens',
    steps: [
      {
        kind: 'ask',
        id: 'opens',
        title: 'Does the valve open at all?',
        ...none,
        choices: [
          { id: 'drips', label: 'Yes, but it drips after closing', next: 'coil' },
          { id: 'dead', label: 'No, it does not open', next: 'call' },
        ],
      },
      {
        kind: 'measure',
        id: 'coil',
        title: 'Measure the coil resistance',
        ...none,
        cautions: [lockOut],
        reading: { label: 'Coil resistance', kind: 'resistance', unit: 'ohm' },
        bandUnit: 'ohm',
        bands: [band('low', null, 25.9, false, false, 'coil-shorted'), band('ok', 25.9, 31.7, true, true, 'clean'), band('high', 31.7, null, false, false, 'call')],
      },
      {
        kind: 'try',
        id: 'clean',
        title: 'Clean the seat',
        ...none,
        action: 'Take out the needle, clean the seat and the tip, reassemble and run 20 shots.',
        fixedNext: 'seat-debris',
        notFixedNext: 'call',
      },
      {
        kind: 'finding',
        id: 'coil-shorted',
        title: 'Coil with shorted turns',
        ...none,
        articleIds: [12],
        causeCode: 'coil-shorted',
        cause: 'Shorted turns keep the field up after switch-off.',
        remedy: ['Replace the coil.', 'Run 50 shots.'],
        parts: [{ name: 'Coil', partNumber: 'BP-COIL-24', quantity: 1 }],
        typicalMinutes: 30,
      },
      {
        kind: 'finding',
        id: 'seat-debris',
        title: 'Debris on the seat',
        ...none,
        articleIds: [7],
        causeCode: 'seat-debris',
        cause: 'Debris on the seat kept the needle from sealing.',
        remedy: ['Keep the cleaned seat in service.', 'Change the supply filter.'],
        parts: [],
      },
      {
        kind: 'handoff',
        id: 'call',
        title: 'Call the application engineer',
        ...none,
        contact: 'The application engineer on call',
        message: 'Say what you measured and send the walk summary.',
      },
    ],
  } satisfies GuideContent);
}

function stepOf<K extends Step['kind']>(content: GuideContent, id: string, kind: K): Extract<Step, { kind: K }> {
  const step = content.steps.find((s) => s.id === id);
  if (!step || step.kind !== kind) throw new Error(`test guide has no ${kind} step '${id}'`);
  return step as Extract<Step, { kind: K }>;
}

function codes(problems: GuideProblem[]): string[] {
  return problems.map((problem) => problem.code);
}

function only(problems: GuideProblem[], code: string): GuideProblem {
  const found = problems.filter((problem) => problem.code === code);
  expect(found, `expected exactly one '${code}' in ${JSON.stringify(problems, null, 1)}`).toHaveLength(1);
  return found[0];
}

describe('validateGuide on a valid guide', () => {
  it('when a guide has an Ask, a three-band Measure, a Try, two Findings and a Hand-off, then it has no errors and no warnings', () => {
    const content = validGuide();
    expect(GuideContent.safeParse(content).success).toBe(true);
    expect(validateGuide(content, ctx)).toEqual({ errors: [], warnings: [] });
  });

  it('when the sample guide is validated against the default causes and the calculators, then it has no errors', () => {
    expect(GuideContent.safeParse(SAMPLE_GUIDE).success).toBe(true);
    const result = validateGuide(SAMPLE_GUIDE, ctx);
    expect(result.errors).toEqual([]);
    expect(new Set(codes(result.warnings))).toEqual(new Set(['finding-no-article']));
  });
});

describe('validateGuide errors on hand-made graphs', () => {
  it('when a Try leads back to the start, then the cycle is an error naming every step on it', () => {
    const content = validGuide();
    stepOf(content, 'clean', 'try').notFixedNext = 'opens';
    const cycle = only(validateGuide(content, ctx).errors, 'cycle');
    expect(cycle.message).toContain("'opens' → 'coil' → 'clean' → 'opens'");
    expect(cycle.stepId).toBe('clean');
    expect(cycle.path).toBe('steps[2].notFixedNext');
  });

  it('when a step points at itself, then that one-step loop is reported', () => {
    const content = validGuide();
    stepOf(content, 'opens', 'ask').choices[1].next = 'opens';
    expect(only(validateGuide(content, ctx).errors, 'cycle').message).toContain("'opens' → 'opens'");
  });

  it('when a step is linked from nowhere, then it is unreachable', () => {
    const content = validGuide();
    content.steps.push({ ...structuredClone(stepOf(content, 'call', 'handoff')), id: 'orphan' });
    const problem = only(validateGuide(content, ctx).errors, 'unreachable');
    expect(problem.stepId).toBe('orphan');
    expect(problem.path).toBe('steps[6]');
  });

  it('when a choice points at a step that does not exist, then the error names the step and the branch', () => {
    const content = validGuide();
    stepOf(content, 'opens', 'ask').choices[1].next = 'nowhere';
    const problem = only(validateGuide(content, ctx).errors, 'branch-missing');
    expect(problem.message).toContain("choice 'No, it does not open'");
    expect(problem.message).toContain("'nowhere'");
    expect(problem.stepId).toBe('opens');
    expect(problem.path).toBe('steps[0].choices[1].next');
  });

  it('when a band points at a missing step, then the band is named', () => {
    const content = validGuide();
    stepOf(content, 'coil', 'measure').bands[2].next = 'gone';
    const problem = only(validateGuide(content, ctx).errors, 'branch-missing');
    expect(problem.message).toContain("band 'Band high'");
    expect(problem.path).toBe('steps[1].bands[2].next');
  });

  it('when the middle band starts above where the low band ends, then there is a gap between those two bands', () => {
    const content = validGuide();
    stepOf(content, 'coil', 'measure').bands[1].min = 26.5;
    const problem = only(validateGuide(content, ctx).errors, 'bands-gap');
    expect(problem.message).toMatch(/^Measure step 'coil': Gap between bands 'low' and 'ok'/);
    expect(problem.message).toContain('25.9 Ω and 26.5 Ω');
    expect(problem.path).toBe('steps[1].bands[1].min');
  });

  it('when the low band runs past the start of the middle one, then there is an overlap between them', () => {
    const content = validGuide();
    stepOf(content, 'coil', 'measure').bands[0].max = 27;
    const problem = only(validateGuide(content, ctx).errors, 'bands-overlap');
    expect(problem.message).toContain("Overlap between bands 'low' and 'ok'");
    expect(problem.message).toContain('25.9 Ω to 27 Ω');
  });

  it('when both neighbours include their shared limit, then that single value is an overlap', () => {
    const content = validGuide();
    stepOf(content, 'coil', 'measure').bands[0].maxInclusive = true;
    expect(only(validateGuide(content, ctx).errors, 'bands-overlap').message).toContain('exactly 25.9 Ω falls in both');
  });

  it('when neither neighbour includes their shared limit, then that single value is a gap', () => {
    const content = validGuide();
    stepOf(content, 'coil', 'measure').bands[2].minInclusive = false;
    stepOf(content, 'coil', 'measure').bands[1].maxInclusive = false;
    expect(only(validateGuide(content, ctx).errors, 'bands-gap').message).toContain("Gap between bands 'ok' and 'high'");
  });

  it('when the bands leave both ends of the line open, then both open ends are reported', () => {
    const content = validGuide();
    const coil = stepOf(content, 'coil', 'measure');
    coil.bands[0].min = 0;
    coil.bands[0].minInclusive = true;
    coil.bands[2].max = 1000;
    coil.bands[2].maxInclusive = true;
    const errors = validateGuide(content, ctx).errors;
    expect(only(errors, 'bands-open-below').message).toContain('below 0 Ω');
    expect(only(errors, 'bands-open-above').message).toContain('above 1000 Ω');
  });

  it('when a Finding has no cause code, then it is an error; when the code is not in the organisation list, then too', () => {
    const content = validGuide();
    stepOf(content, 'seat-debris', 'finding').causeCode = '';
    expect(only(validateGuide(content, ctx).errors, 'cause-missing').stepId).toBe('seat-debris');

    stepOf(content, 'seat-debris', 'finding').causeCode = 'gremlins';
    expect(only(validateGuide(content, ctx).errors, 'cause-unknown').path).toBe('steps[4].causeCode');
    // Without an organisation list, any well-formed code is accepted.
    expect(codes(validateGuide(content).errors)).not.toContain('cause-unknown');
  });

  it('when a Finding has no remedy, then it is an error', () => {
    const content = validGuide();
    stepOf(content, 'seat-debris', 'finding').remedy = [];
    expect(only(validateGuide(content, ctx).errors, 'remedy-missing').path).toBe('steps[4].remedy');
  });

  it('when an Ask has one choice, then it needs at least two', () => {
    const content = validGuide();
    stepOf(content, 'opens', 'ask').choices.pop();
    const errors = validateGuide(content, ctx).errors;
    expect(only(errors, 'too-few-choices').stepId).toBe('opens');
  });

  it('when a Measure has no bands, then it leads nowhere', () => {
    const content = validGuide();
    stepOf(content, 'coil', 'measure').bands = [];
    expect(only(validateGuide(content, ctx).errors, 'no-branches').stepId).toBe('coil');
  });

  it('when two steps share an id, then the second is a duplicate', () => {
    const content = validGuide();
    content.steps[4] = { ...content.steps[4], id: 'clean' } as Step;
    const problem = only(validateGuide(content, ctx).errors, 'duplicate-id');
    expect(problem.message).toContain("Steps 3 and 5 share the id 'clean'");
    expect(problem.path).toBe('steps[4].id');
  });

  it('when two choices of one step share an id, then that is a duplicate too', () => {
    const content = validGuide();
    stepOf(content, 'opens', 'ask').choices[1].id = 'drips';
    expect(only(validateGuide(content, ctx).errors, 'duplicate-id').path).toBe('steps[0].choices[1].id');
  });

  it('when the start step is not chosen or does not exist, then that is an error and unreachable steps are not piled on', () => {
    const content = validGuide();
    content.startStepId = '';
    expect(codes(validateGuide(content, ctx).errors)).toEqual(['start-missing']);
    content.startStepId = 'missing';
    expect(codes(validateGuide(content, ctx).errors)).toEqual(['start-unknown']);
  });

  it('when a title, a caution action or a hand-off message is empty, then each is an error at its path', () => {
    const content = validGuide();
    stepOf(content, 'clean', 'try').title = '  ';
    stepOf(content, 'coil', 'measure').cautions[0].action = '';
    stepOf(content, 'call', 'handoff').message = '';
    const errors = validateGuide(content, ctx).errors;
    expect(errors.map((e) => [e.code, e.path])).toEqual([
      ['caution-action-missing', 'steps[1].cautions[0].action'],
      ['empty-text', 'steps[2].title'],
      ['empty-text', 'steps[5].message'],
    ]);
  });

  it('when the band unit is not of the reading kind, then the unit is refused', () => {
    const content = validGuide();
    stepOf(content, 'coil', 'measure').bandUnit = 'bar';
    const problem = only(validateGuide(content, ctx).errors, 'band-unit-kind');
    expect(problem.message).toContain("band unit 'bar' does not fit the reading, a resistance");
  });

  it('when the reading unit is not of the reading kind, then it is refused', () => {
    const content = validGuide();
    stepOf(content, 'coil', 'measure').reading.unit = 'V';
    expect(only(validateGuide(content, ctx).errors, 'reading-unit-kind').path).toBe('steps[1].reading.unit');
  });

  it('when a Measure routes on a calculator output, then the band unit must be of the output kind', () => {
    const content = validGuide();
    const coil = stepOf(content, 'coil', 'measure');
    coil.calculator = {
      id: 'coil-check',
      readingInput: 'measuredResistance',
      fixedInputs: { nominalResistance: { value: 28.8, unit: 'ohm' }, supplyVoltage: { value: 24, unit: 'V' } },
      output: 'deviation',
    };
    // Bands still in ohm, but the deviation is a plain number.
    expect(only(validateGuide(content, ctx).errors, 'band-unit-kind').message).toContain("calculator output 'deviation', a plain number");
    coil.bandUnit = '%';
    coil.bands = [band('low', null, -10, false, false, 'coil-shorted'), band('ok', -10, 10, true, true, 'clean'), band('high', 10, null, false, false, 'call')];
    expect(validateGuide(content, ctx).errors).toEqual([]);
  });

  it('when a calculator, its output or a fixed input is unknown, then each is an error', () => {
    const content = validGuide();
    const coil = stepOf(content, 'coil', 'measure');
    coil.calculator = { id: 'crystal-ball', fixedInputs: {}, output: 'deviation', readingInput: 'measuredResistance' };
    expect(only(validateGuide(content, ctx).errors, 'calculator-unknown').path).toBe('steps[1].calculator.id');

    coil.calculator = {
      id: 'coil-check',
      readingInput: 'measuredResistance',
      fixedInputs: { nominalResistance: { value: 28.8, unit: 'bar' }, colour: 'red' },
      output: 'mood',
    };
    const errors = validateGuide(content, ctx).errors;
    expect(only(errors, 'calculator-output-unknown').message).toContain("no output 'mood'");
    expect(only(errors, 'calculator-input-unknown').path).toBe('steps[1].calculator.fixedInputs.colour');
    expect(only(errors, 'calculator-input-value').message).toContain("'bar' is not a resistance unit");
    // Without the declarations the calculator cannot be checked, and nothing is claimed about it.
    expect(codes(validateGuide(content).errors).filter((code) => code.startsWith('calculator'))).toEqual([]);
  });

  it('when a calculator output is a verdict, then it cannot be routed by bands', () => {
    const content = validGuide();
    stepOf(content, 'coil', 'measure').calculator = {
      id: 'coil-check',
      readingInput: 'measuredResistance',
      fixedInputs: {},
      output: 'verdict',
    };
    expect(only(validateGuide(content, ctx).errors, 'calculator-output-not-number').path).toBe('steps[1].calculator.output');
  });

  it('when the guide links an article that does not exist, then it is an error', () => {
    const content = validGuide();
    expect(only(validateGuide(content, { ...ctx, articleIds: [7] }).errors, 'article-unknown').path).toBe('steps[3].articleIds[0]');
  });

  it('when there are more steps than allowed, then the count is an error', () => {
    const content = chainGuide(GUIDE_LIMITS.steps + 1);
    expect(codes(validateGuide(content).errors)).toEqual(['too-many-steps']);
  });
});

describe('validateGuide warnings', () => {
  it('when a Finding links no article, then it is a warning, not an error', () => {
    const content = validGuide();
    stepOf(content, 'seat-debris', 'finding').articleIds = [];
    const result = validateGuide(content, ctx);
    expect(result.errors).toEqual([]);
    expect(only(result.warnings, 'finding-no-article').stepId).toBe('seat-debris');
  });

  it('when the guide has no Hand-off, then it is a warning', () => {
    const content = validGuide();
    stepOf(content, 'opens', 'ask').choices[1].next = 'coil-shorted';
    stepOf(content, 'coil', 'measure').bands[2].next = 'coil-shorted';
    stepOf(content, 'clean', 'try').notFixedNext = 'coil-shorted';
    content.steps = content.steps.filter((step) => step.kind !== 'handoff');
    const result = validateGuide(content, ctx);
    expect(result.errors).toEqual([]);
    expect(codes(result.warnings)).toEqual(['no-handoff']);
  });

  it('when a path is longer than 15 steps, then it is a warning naming where it ends', () => {
    expect(codes(validateGuide(chainGuide(GUIDE_LIMITS.longPath)).warnings)).toEqual([]);
    const long = validateGuide(chainGuide(GUIDE_LIMITS.longPath + 1));
    expect(long.errors).toEqual([]);
    const warning = only(long.warnings, 'path-too-long');
    expect(warning.message).toContain(`${GUIDE_LIMITS.longPath + 1} steps`);
    expect(warning.stepId).toBe('end');
  });
});

describe('bands', () => {
  const coil = [band('low', null, 25.9, false, false, 'a'), band('ok', 25.9, 31.7, true, true, 'b'), band('high', 31.7, null, false, false, 'c')];

  it('when a value sits on a shared limit, then it falls in the band that includes that limit', () => {
    expect(bandFor(coil, 25.9)?.id).toBe('ok');
    expect(bandFor(coil, 31.7)?.id).toBe('ok');
    expect(bandFor(coil, 25.899)?.id).toBe('low');
    expect(bandFor(coil, 31.701)?.id).toBe('high');
    expect(bandFor(coil, -1e300)?.id).toBe('low');
    expect(bandFor(coil, Number.NaN)).toBeUndefined();
  });

  it('when a band is printed, then its limits read as an inequality in its unit', () => {
    expect(describeBand(coil[1], 'ohm')).toBe('25.9 ≤ x ≤ 31.7 Ω');
    expect(describeBand(coil[0], 'ohm')).toBe('x < 25.9 Ω');
  });

  it('when a band sits inside another, then the overlap is still found', () => {
    const problems = bandProblems([band('all', null, null, false, false, 'a'), band('inner', 1, 2, true, false, 'b')], 'ohm');
    expect(problems.map((p) => p.code)).toEqual(['bands-overlap']);
  });

  it('when a band runs backwards, then it contains no value', () => {
    const problems = bandProblems([band('back', 5, 3, true, true, 'a')], 'V');
    expect(problems[0].code).toBe('band-empty');
  });

  // Any sorted set of distinct cut points, each included on exactly one side, partitions the line.
  const partition = fc
    .uniqueArray(fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true }), { minLength: 0, maxLength: 10 })
    .chain((cuts) => fc.tuple(fc.constant([...cuts].sort((a, b) => a - b)), fc.array(fc.boolean(), { minLength: cuts.length, maxLength: cuts.length })))
    .map(([cuts, lowerSideIncludes]) => {
      const bands: Band[] = [];
      for (let i = 0; i <= cuts.length; i++) {
        bands.push(band(`b${i}`, i === 0 ? null : cuts[i - 1], i === cuts.length ? null : cuts[i], i === 0 ? false : !lowerSideIncludes[i - 1], i === cuts.length ? false : lowerSideIncludes[i], 'x'));
      }
      return bands;
    });

  it('when bands partition the line in any order, then there are no problems and every value falls in exactly one band', () => {
    fc.assert(
      fc.property(partition, fc.double({ noNaN: true }), fc.integer(), (bands, value, seed) => {
        const shuffled = [...bands].sort((a, b) => ((a.id.length * 31 + seed) % 7) - ((b.id.length * 31 + seed) % 7));
        expect(bandProblems(shuffled, 'ohm')).toEqual([]);
        // The cut points themselves are where an inclusive/exclusive slip would show.
        const cuts = bands.flatMap((b) => (b.min === null ? [] : [b.min]));
        for (const probe of [value, ...cuts]) expect(shuffled.filter((b) => bandFor([b], probe)).length).toBe(1);
      }),
    );
  });

  it('when any one band is taken out of a partition of two or more, then a gap or an open end is reported', () => {
    fc.assert(
      fc.property(
        partition.filter((bands) => bands.length >= 2),
        fc.nat(),
        (bands, pick) => {
          const rest = bands.filter((_, index) => index !== pick % bands.length);
          const found = bandProblems(rest, 'ohm').map((p) => p.code);
          expect(found.some((code) => ['bands-gap', 'bands-open-below', 'bands-open-above'].includes(code))).toBe(true);
        },
      ),
    );
  });
});

describe('schemas', () => {
  it('when a draft holds empty text and unchosen branches, then the draft schema accepts it and the strict one names each field', () => {
    const draft = validGuide();
    stepOf(draft, 'opens', 'ask').choices[1] = { id: 'dead', label: '', next: '' };
    stepOf(draft, 'clean', 'try').action = '';
    expect(GuideDraftContent.safeParse(draft).success).toBe(true);
    const strict = GuideContent.safeParse(draft);
    expect(strict.success).toBe(false);
    const messages = strict.error?.issues.map((issue) => `${issue.path.join('.')}: ${issue.message}`);
    expect(messages).toEqual(
      expect.arrayContaining([
        'steps.0.choices.1.label: Choice label must not be empty',
        expect.stringMatching(/^steps\.0\.choices\.1\.next: Choice next step must be/),
        'steps.2.action: Action must not be empty',
      ]),
    );
    expect(codes(validateGuide(draft, ctx).errors)).toEqual(expect.arrayContaining(['empty-text', 'branch-empty']));
  });

  it('when a step has an unknown field or kind, then the schema says so in plain words', () => {
    const content = validGuide() as unknown as { steps: Record<string, unknown>[] };
    content.steps[0].colour = 'red';
    content.steps[1].kind = 'guess';
    const issues = GuideDraftContent.safeParse(content).error?.issues.map((issue) => issue.message);
    expect(issues).toEqual(["Ask step has unknown field 'colour'", 'Step kind must be one of ask, measure, try, finding, handoff']);
  });

  it('when a guide has 5,000 steps, then the schema refuses it with one message about the limit', () => {
    const huge = chainGuide(5000);
    const issues = GuideDraftContent.safeParse(huge).error?.issues ?? [];
    expect(issues.map((issue) => issue.message)).toEqual([`Steps: at most ${GUIDE_LIMITS.steps} allowed`]);
  });

  it('when a body document is not of type doc or is over the size limit, then it is refused', () => {
    const content = validGuide();
    content.steps[0].body = { doc: { type: 'paragraph' } as never };
    expect(GuideContent.safeParse(content).error?.issues[0].message).toBe('Body document must have type "doc"');
    content.steps[0].body = { doc: { type: 'doc', content: [{ type: 'text', text: 'x'.repeat(GUIDE_LIMITS.bodyBytes) }] } };
    expect(GuideContent.safeParse(content).error?.issues[0].message).toMatch(/^Body is too long/);
    expect(only(validateGuide(content, ctx).errors, 'too-long').path).toBe('steps[0].body.doc');
  });
});

/** A straight line of Try steps ending in a Hand-off; `length` steps in all. */
function chainGuide(length: number): GuideContent {
  const steps: Step[] = [];
  for (let i = 0; i < length - 1; i++) {
    steps.push({
      kind: 'try',
      id: `s${i}`,
      title: `Try ${i}`,
      ...none,
      action: 'Do one more thing.',
      fixedNext: null,
      notFixedNext: i === length - 2 ? 'end' : `s${i + 1}`,
    });
  }
  steps.push({ kind: 'handoff', id: 'end', title: 'Call for help', ...none, contact: 'Senior technician', message: 'Say what you tried.' });
  return { startStepId: steps[0].id, steps };
}

/** 300 steps: an Ask of 12 choices, 12 Asks of 12, then 12 of those 144 ask again (the last with 11). */
function wideTree(): GuideContent {
  const steps: Step[] = [];
  const finding = (id: string): Step => ({
    kind: 'finding',
    id,
    title: `Finding ${id}`,
    ...none,
    articleIds: [1],
    causeCode: 'other',
    cause: 'Found it.',
    remedy: ['Fix it.'],
    parts: [],
  });
  const ask = (id: string, children: string[]): Step => ({
    kind: 'ask',
    id,
    title: `Question ${id}`,
    ...none,
    choices: children.map((child, index) => ({ id: `c${index}`, label: `Answer ${index}`, next: child })),
  });
  const range = (n: number) => Array.from({ length: n }, (_, i) => i);
  steps.push(
    ask(
      'root',
      range(12).map((i) => `a${i}`),
    ),
  );
  for (const i of range(12))
    steps.push(
      ask(
        `a${i}`,
        range(12).map((j) => `a${i}-${j}`),
      ),
    );
  for (const i of range(12)) {
    for (const j of range(12)) {
      const id = `a${i}-${j}`;
      if (i === 0) {
        const width = j === 11 ? 11 : 12;
        steps.push(
          ask(
            id,
            range(width).map((k) => `${id}-${k}`),
          ),
        );
        for (const k of range(width)) steps.push(finding(`${id}-${k}`));
      } else {
        steps.push(finding(id));
      }
    }
  }
  steps[steps.length - 1] = { kind: 'handoff', id: steps[steps.length - 1].id, title: 'Call', ...none, contact: 'Engineer', message: 'Say what you saw.' };
  return { startStepId: 'root', steps };
}

describe('validateGuide speed', () => {
  // Loose on purpose: it is there to catch exponential blow-ups, not to time the machine.
  function medianMs(run: () => void): number {
    run();
    const times: number[] = [];
    for (let i = 0; i < 5; i++) {
      const start = performance.now();
      run();
      times.push(performance.now() - start);
    }
    return times.sort((a, b) => a - b)[2];
  }

  it('when a 300-step chain is validated, then it is correct apart from the long path and takes well under 50 ms', () => {
    const content = chainGuide(GUIDE_LIMITS.steps);
    const result = validateGuide(content, ctx);
    expect(result.errors).toEqual([]);
    expect(codes(result.warnings)).toEqual(['path-too-long']);
    expect(medianMs(() => validateGuide(content, ctx))).toBeLessThan(50);
  });

  it('when a 300-step wide tree is validated, then it has no errors and takes well under 50 ms', () => {
    const content = wideTree();
    expect(content.steps).toHaveLength(300);
    expect(GuideContent.safeParse(content).success).toBe(true);
    expect(validateGuide(content, ctx)).toEqual({ errors: [], warnings: [] });
    expect(medianMs(() => validateGuide(content, ctx))).toBeLessThan(50);
  });

  it('when a 300-step chain closes into one big loop, then the loop is found without overflowing the stack', () => {
    const content = chainGuide(GUIDE_LIMITS.steps);
    const last = content.steps[content.steps.length - 2];
    if (last.kind !== 'try') throw new Error('chain ends in a try');
    last.notFixedNext = 's0';
    const errors = validateGuide(content, ctx).errors;
    expect(codes(errors)).toContain('cycle');
    expect(medianMs(() => validateGuide(content, ctx))).toBeLessThan(50);
  });
});
