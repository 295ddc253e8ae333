// Checks a guide version's content as a whole: the rules that block submit and publish (errors)
// and the ones worth a second look (warnings). Pure and linear in the size of the guide.
import type { CalculatorDeclaration, InputDeclaration } from '../calculators/types';
import { KIND_LABELS, UNITS, isQuantityKind, isUnitOf, kindOfUnit, kindsOfUnit, type QuantityKind } from '../units';
import { bandProblems } from './bands';
import { branchesOf } from './graph';
import { GUIDE_LIMITS, ID_PATTERN, STEP_KIND_LABELS, isEndStep, type DraftStep, type GuideDraftContent } from './schema';

export { bandFor, bandContains, bandProblems, describeBand } from './bands';

export interface GuideProblem {
  /** Stable machine code, e.g. 'cycle', 'bands-gap'; the UI may key help text on it. */
  code: string;
  message: string;
  stepId?: string;
  /** Path inside the content, e.g. `steps[3].choices[1].next`. */
  path?: string;
}

export interface ValidationContext {
  /** The organisation's cause codes; when given, a Finding must use one of them. */
  causeCodes?: readonly string[];
  /** Calculator declarations; when given, a Measure's calculator, inputs and output are checked. */
  calculators?: readonly CalculatorDeclaration[];
  /** Articles that exist; when given, links to any other article are errors. */
  articleIds?: readonly number[];
}

export interface GuideValidation {
  errors: GuideProblem[];
  warnings: GuideProblem[];
}

// One loop can be reported many ways; past this many the author has enough to go on.
const MAX_CYCLE_REPORTS = 20;

interface Report {
  error(code: string, message: string, stepId?: string, path?: string): void;
  warning(code: string, message: string, stepId?: string, path?: string): void;
}

function orList(items: readonly string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} or ${items[items.length - 1]}`;
}

function stepName(step: DraftStep): string {
  return `${STEP_KIND_LABELS[step.kind]} step '${step.id}'`;
}

function utf8Bytes(value: unknown): number {
  return new TextEncoder().encode(JSON.stringify(value) ?? '').length;
}

/**
 * Validates draft or finished content. The content must already have the draft shape
 * (GuideDraftContent); everything a finished guide needs beyond that shape is checked here, so the
 * editor can show every problem live and the server can refuse to submit or publish.
 */
export function validateGuide(content: GuideDraftContent, ctx: ValidationContext = {}): GuideValidation {
  const errors: GuideProblem[] = [];
  const warnings: GuideProblem[] = [];
  const problem = (code: string, message: string, stepId?: string, path?: string): GuideProblem => ({
    code,
    message,
    ...(stepId !== undefined ? { stepId } : {}),
    ...(path !== undefined ? { path } : {}),
  });
  const report: Report = {
    error: (...args) => errors.push(problem(...args)),
    warning: (...args) => warnings.push(problem(...args)),
  };

  const { steps } = content;
  if (steps.length === 0) {
    report.error('no-steps', 'The guide has no steps yet: add a start step', undefined, 'steps');
    return { errors, warnings };
  }
  if (steps.length > GUIDE_LIMITS.steps) {
    report.error('too-many-steps', `The guide has ${steps.length} steps; at most ${GUIDE_LIMITS.steps} are allowed`, undefined, 'steps');
  }

  // The first step with an id owns it; later ones are reported as duplicates and left out of the graph.
  const indexOf = new Map<string, number>();
  steps.forEach((step, index) => {
    if (!ID_PATTERN.test(step.id)) {
      report.error('bad-id', `Step ${index + 1} has an invalid id '${step.id}': use 1 to 40 lower-case letters, digits or hyphens`, step.id, `steps[${index}].id`);
    }
    const earlier = indexOf.get(step.id);
    if (earlier !== undefined) {
      report.error('duplicate-id', `Steps ${earlier + 1} and ${index + 1} share the id '${step.id}': every step needs its own id`, step.id, `steps[${index}].id`);
    } else {
      indexOf.set(step.id, index);
    }
  });

  let startIndex: number | undefined;
  if (content.startStepId === '') {
    report.error('start-missing', 'The guide has no start step: choose the step a walk begins with', undefined, 'startStepId');
  } else if (!indexOf.has(content.startStepId)) {
    report.error('start-unknown', `The start step '${content.startStepId}' does not exist`, undefined, 'startStepId');
  } else {
    startIndex = indexOf.get(content.startStepId);
  }

  const articleSet = ctx.articleIds ? new Set(ctx.articleIds) : undefined;
  const causeSet = ctx.causeCodes ? new Set(ctx.causeCodes) : undefined;

  // Edges as step indexes; only branches that resolve to an owning step take part in the graph.
  const edges: { to: number; label: string; path: string }[][] = steps.map(() => []);
  steps.forEach((step, index) => {
    const at = `steps[${index}]`;
    checkStep(step, at, report, { articleSet, causeSet, calculators: ctx.calculators });

    const branches = branchesOf(step);
    if (!isEndStep(step) && branches.length === 0) {
      const what = step.kind === 'ask' ? 'choices: add at least two' : 'bands: add at least one';
      report.error('no-branches', `${stepName(step)} leads nowhere: it has no ${what}`, step.id, `${at}.${step.kind === 'ask' ? 'choices' : 'bands'}`);
    }
    for (const branch of branches) {
      const path = `${at}.${branch.path}`;
      if (branch.next === '') {
        report.error('branch-empty', `In ${stepName(step)}, ${branch.label} does not lead to a step yet`, step.id, path);
        continue;
      }
      const target = indexOf.get(branch.next);
      if (target === undefined) {
        report.error('branch-missing', `In ${stepName(step)}, ${branch.label} points at step '${branch.next}', which does not exist`, step.id, path);
        continue;
      }
      // A duplicate step is not in the graph: its branches would be attributed to the wrong step.
      if (indexOf.get(step.id) === index) edges[index].push({ to: target, label: branch.label, path });
    }
  });

  checkReachability(content, steps, edges, startIndex, indexOf, report);
  const hasCycle = checkCycles(steps, edges, indexOf, report);
  if (!hasCycle && startIndex !== undefined) checkLongestPath(steps, edges, startIndex, report);

  if (!steps.some((step) => step.kind === 'handoff')) {
    report.warning('no-handoff', 'The guide has no Hand-off step: when it runs out, people are left with nobody to call');
  }
  return { errors, warnings };
}

function checkReachability(content: GuideDraftContent, steps: readonly DraftStep[], edges: { to: number }[][], startIndex: number | undefined, indexOf: Map<string, number>, report: Report): void {
  // Without a start every step would read as unreachable, which only buries the real message.
  if (startIndex === undefined) return;
  const seen = new Uint8Array(steps.length);
  const queue = [startIndex];
  seen[startIndex] = 1;
  for (let head = 0; head < queue.length; head++) {
    for (const edge of edges[queue[head]]) {
      if (!seen[edge.to]) {
        seen[edge.to] = 1;
        queue.push(edge.to);
      }
    }
  }
  steps.forEach((step, index) => {
    if (seen[index] || indexOf.get(step.id) !== index) return;
    report.error('unreachable', `${stepName(step)} cannot be reached from the start step '${content.startStepId}': link it from another step or delete it`, step.id, `steps[${index}]`);
  });
}

/** Iterative depth-first search, so a 300-step chain cannot overflow the call stack. */
function checkCycles(steps: readonly DraftStep[], edges: { to: number; label: string; path: string }[][], indexOf: Map<string, number>, report: Report): boolean {
  const WHITE = 0;
  const GREY = 1;
  const BLACK = 2;
  const colour = new Uint8Array(steps.length);
  const reported = new Set<string>();
  let found = false;

  for (let root = 0; root < steps.length; root++) {
    if (colour[root] !== WHITE || indexOf.get(steps[root].id) !== root) continue;
    const stack: { node: number; edge: number }[] = [{ node: root, edge: 0 }];
    colour[root] = GREY;
    while (stack.length > 0) {
      const frame = stack[stack.length - 1];
      const out = edges[frame.node];
      if (frame.edge >= out.length) {
        colour[frame.node] = BLACK;
        stack.pop();
        continue;
      }
      const edge = out[frame.edge++];
      if (colour[edge.to] === WHITE) {
        colour[edge.to] = GREY;
        stack.push({ node: edge.to, edge: 0 });
      } else if (colour[edge.to] === GREY) {
        found = true;
        const from = stack.findIndex((entry) => entry.node === edge.to);
        const loop = stack.slice(from).map((entry) => steps[entry.node].id);
        const key = [...loop].sort().join(' ');
        if (reported.has(key) || reported.size >= MAX_CYCLE_REPORTS) continue;
        reported.add(key);
        const owner = steps[frame.node];
        report.error('cycle', `Steps loop back on themselves: ${[...loop, loop[0]].map((id) => `'${id}'`).join(' → ')}; ${edge.label} of step '${owner.id}' closes the loop`, owner.id, edge.path);
      }
    }
  }
  return found;
}

/** Longest path from the start, counted in steps, by dynamic programming over a topological order. */
function checkLongestPath(steps: readonly DraftStep[], edges: { to: number }[][], startIndex: number, report: Report): void {
  const indegree = new Int32Array(steps.length);
  const reachable = new Uint8Array(steps.length);
  const queue = [startIndex];
  reachable[startIndex] = 1;
  for (let head = 0; head < queue.length; head++) {
    for (const edge of edges[queue[head]]) {
      indegree[edge.to]++;
      if (!reachable[edge.to]) {
        reachable[edge.to] = 1;
        queue.push(edge.to);
      }
    }
  }
  const length = new Int32Array(steps.length);
  length[startIndex] = 1;
  const ready = [startIndex];
  let longest = startIndex;
  for (let head = 0; head < ready.length; head++) {
    const node = ready[head];
    if (length[node] > length[longest]) longest = node;
    for (const edge of edges[node]) {
      if (length[node] + 1 > length[edge.to]) length[edge.to] = length[node] + 1;
      if (--indegree[edge.to] === 0) ready.push(edge.to);
    }
  }
  if (length[longest] > GUIDE_LIMITS.longPath) {
    report.warning(
      'path-too-long',
      `The longest path has ${length[longest]} steps, from the start to '${steps[longest].id}'; walks of more than ${GUIDE_LIMITS.longPath} steps tire people out`,
      steps[longest].id,
    );
  }
}

interface StepContext {
  articleSet?: Set<number>;
  causeSet?: Set<string>;
  calculators?: readonly CalculatorDeclaration[];
}

function checkStep(step: DraftStep, at: string, report: Report, ctx: StepContext): void {
  const name = stepName(step);
  const text = (value: string, label: string, max: number, path: string, code = 'empty-text') => {
    if (value.trim() === '') report.error(code, `${name}: ${label} is empty`, step.id, `${at}.${path}`);
    else if (value.length > max) report.error('too-long', `${name}: ${label} is longer than ${max} characters`, step.id, `${at}.${path}`);
  };
  const count = (length: number, label: string, max: number, path: string) => {
    if (length > max) report.error('too-many', `${name}: at most ${max} ${label} are allowed, it has ${length}`, step.id, `${at}.${path}`);
  };
  const uniqueIds = (items: readonly { id: string }[], label: string, path: string) => {
    const seen = new Set<string>();
    items.forEach((item, index) => {
      if (!ID_PATTERN.test(item.id)) {
        report.error('bad-id', `${name}: ${label} id '${item.id}' must be 1 to 40 lower-case letters, digits or hyphens`, step.id, `${at}.${path}[${index}].id`);
      }
      if (seen.has(item.id)) {
        report.error('duplicate-id', `${name}: two ${label}s share the id '${item.id}'`, step.id, `${at}.${path}[${index}].id`);
      }
      seen.add(item.id);
    });
  };

  text(step.title, 'the title', GUIDE_LIMITS.stepTitle, 'title');
  if (step.body && utf8Bytes(step.body.doc) > GUIDE_LIMITS.bodyBytes) {
    report.error('too-long', `${name}: the body is larger than ${GUIDE_LIMITS.bodyBytes / 1000} kB`, step.id, `${at}.body.doc`);
  }

  count(step.cautions.length, 'cautions', GUIDE_LIMITS.cautionsPerStep, 'cautions');
  uniqueIds(step.cautions, 'caution', 'cautions');
  step.cautions.forEach((caution, index) => {
    text(caution.text, `caution ${index + 1}'s text (what the danger is)`, GUIDE_LIMITS.text, `cautions[${index}].text`);
    text(caution.action, `caution ${index + 1}'s action (what to do before going on)`, GUIDE_LIMITS.text, `cautions[${index}].action`, 'caution-action-missing');
  });
  count(step.photoIds.length, 'photos', GUIDE_LIMITS.photosPerStep, 'photoIds');
  count(step.articleIds.length, 'linked articles', GUIDE_LIMITS.articlesPerStep, 'articleIds');
  if (ctx.articleSet) {
    step.articleIds.forEach((articleId, index) => {
      if (!ctx.articleSet?.has(articleId)) {
        report.error('article-unknown', `${name} links to article ${articleId}, which does not exist`, step.id, `${at}.articleIds[${index}]`);
      }
    });
  }

  switch (step.kind) {
    case 'ask':
      if (step.choices.length === 1) {
        report.error('too-few-choices', `${name} has only one choice: an Ask needs at least ${GUIDE_LIMITS.minChoices}`, step.id, `${at}.choices`);
      }
      count(step.choices.length, 'choices', GUIDE_LIMITS.maxChoices, 'choices');
      uniqueIds(step.choices, 'choice', 'choices');
      step.choices.forEach((choice, index) => text(choice.label, `choice ${index + 1}'s label`, GUIDE_LIMITS.label, `choices[${index}].label`));
      break;
    case 'measure':
      checkMeasure(step, at, report, ctx.calculators);
      break;
    case 'try':
      text(step.action, 'the action', GUIDE_LIMITS.text, 'action');
      break;
    case 'finding':
      if (step.causeCode === '') {
        report.error('cause-missing', `${name} has no cause code: choose one from the list of causes`, step.id, `${at}.causeCode`);
      } else if (ctx.causeSet && !ctx.causeSet.has(step.causeCode)) {
        report.error('cause-unknown', `${name}: cause code '${step.causeCode}' is not in the organisation's list of causes`, step.id, `${at}.causeCode`);
      }
      text(step.cause, 'the cause', GUIDE_LIMITS.text, 'cause');
      if (step.remedy.length === 0) {
        report.error('remedy-missing', `${name} has no remedy: add at least one step of the fix`, step.id, `${at}.remedy`);
      }
      count(step.remedy.length, 'remedy steps', GUIDE_LIMITS.remedyItems, 'remedy');
      step.remedy.forEach((item, index) => text(item, `remedy step ${index + 1}`, GUIDE_LIMITS.remedyItem, `remedy[${index}]`));
      count(step.parts.length, 'parts', GUIDE_LIMITS.parts, 'parts');
      step.parts.forEach((part, index) => text(part.name, `part ${index + 1}'s name`, GUIDE_LIMITS.partName, `parts[${index}].name`));
      if (step.articleIds.length === 0) {
        report.warning('finding-no-article', `${name} links to no article: an article helps people carry out the remedy`, step.id, `${at}.articleIds`);
      }
      break;
    case 'handoff':
      text(step.contact, 'whom to call', GUIDE_LIMITS.label, 'contact');
      text(step.message, 'what to tell them', GUIDE_LIMITS.text, 'message');
      break;
  }
}

function unitChoices(kind: QuantityKind): string {
  return orList(UNITS[kind].map((spec) => spec.unit));
}

/** Kinds whose units a calculator input accepts; undefined when it takes any unit. */
function inputKinds(input: InputDeclaration): QuantityKind[] | undefined {
  if (input.kind === 'any') return undefined;
  const main = input.kind === 'list' ? input.listKind : input.kind;
  const kinds = main && isQuantityKind(main) ? [main] : [];
  return [...kinds, ...(input.otherKinds ?? [])];
}

function checkMeasure(step: Extract<DraftStep, { kind: 'measure' }>, at: string, report: Report, calculators: readonly CalculatorDeclaration[] | undefined): void {
  const name = stepName(step);
  const err = (code: string, message: string, path: string) => report.error(code, `${name}: ${message}`, step.id, `${at}.${path}`);
  const { reading } = step;

  if (reading.label.trim() === '') err('empty-text', 'the reading label is empty', 'reading.label');
  const readingKind = isQuantityKind(reading.kind) ? reading.kind : undefined;
  if (!readingKind) {
    err('reading-kind', `'${reading.kind}' is not a kind of reading`, 'reading.kind');
  } else if (reading.unit === '') {
    err('empty-text', `the reading has no unit: use ${unitChoices(readingKind)}`, 'reading.unit');
  } else if (!isUnitOf(reading.unit, readingKind)) {
    err('reading-unit-kind', `reading unit '${reading.unit}' is not a ${KIND_LABELS[readingKind]} unit: use ${unitChoices(readingKind)}`, 'reading.unit');
  }

  // The bands are on the reading, or on the calculator output when there is one.
  let bandKind: QuantityKind | undefined = step.calculator ? undefined : readingKind;
  let bandWhat = readingKind ? `the reading, a ${KIND_LABELS[readingKind]}` : 'the reading';

  const calc = step.calculator;
  if (calc) {
    if (calc.id.trim() === '') err('empty-text', 'no calculator is chosen', 'calculator.id');
    if (calc.output.trim() === '') err('empty-text', 'no calculator output is chosen for the bands', 'calculator.output');
    if (calc.readingInput === undefined) {
      report.warning('calculator-reading-unused', `${name}: the reading does not feed the calculator; choose the input it fills`, step.id, `${at}.calculator.readingInput`);
    }
    const decl = calculators && calc.id.trim() !== '' ? calculators.find((c) => c.id === calc.id) : undefined;
    if (calculators && calc.id.trim() !== '' && !decl) {
      err('calculator-unknown', `there is no calculator '${calc.id}'`, 'calculator.id');
    }
    if (decl) {
      const inputs = new Map(decl.inputs.map((input) => [input.name, input]));
      const inputNames = orList(decl.inputs.map((input) => input.name));

      for (const [inputName, value] of Object.entries(calc.fixedInputs)) {
        const path = `calculator.fixedInputs.${inputName}`;
        const input = inputs.get(inputName);
        if (!input) {
          err('calculator-input-unknown', `calculator '${decl.id}' has no input '${inputName}': it takes ${inputNames}`, path);
          continue;
        }
        const problem = fixedInputProblem(input, value);
        if (problem) err('calculator-input-value', problem, path);
      }

      if (calc.readingInput !== undefined) {
        const input = inputs.get(calc.readingInput);
        if (!input) {
          err('calculator-input-unknown', `calculator '${decl.id}' has no input '${calc.readingInput}' for the reading: it takes ${inputNames}`, 'calculator.readingInput');
        } else if (Object.prototype.hasOwnProperty.call(calc.fixedInputs, calc.readingInput)) {
          err('calculator-reading-input', `input '${calc.readingInput}' is both fixed and filled by the reading`, 'calculator.readingInput');
        } else {
          const kinds = inputKinds(input);
          const takesReading = kinds === undefined ? true : readingKind !== undefined && kinds.includes(readingKind) && input.kind !== 'list';
          if (!takesReading) {
            const what = readingKind ? `a ${KIND_LABELS[readingKind]} reading` : 'this reading';
            err('calculator-reading-input', `input '${input.name}' (${input.label.toLowerCase()}) cannot take ${what}`, 'calculator.readingInput');
          }
        }
      }

      const output = calc.output.trim() === '' ? undefined : decl.outputs.find((o) => o.name === calc.output);
      if (calc.output.trim() !== '' && !output) {
        err('calculator-output-unknown', `calculator '${decl.id}' has no output '${calc.output}': it gives ${orList(decl.outputs.map((o) => o.name))}`, 'calculator.output');
      } else if (output && output.kind === 'verdict') {
        err('calculator-output-not-number', `output '${output.name}' is a verdict, not a number: bands need a number`, 'calculator.output');
      } else if (output) {
        bandKind = outputKind(output, calc, readingKind);
        bandWhat = bandKind ? `calculator output '${output.name}', a ${KIND_LABELS[bandKind]}` : `calculator output '${output.name}'`;
      }
    }
  }

  if (step.bandUnit === '') {
    err('empty-text', 'the bands have no unit', 'bandUnit');
  } else if (bandKind && !isUnitOf(step.bandUnit, bandKind)) {
    err('band-unit-kind', `band unit '${step.bandUnit}' does not fit ${bandWhat}: use ${unitChoices(bandKind)}`, 'bandUnit');
  } else if (!bandKind && kindsOfUnit(step.bandUnit).length === 0) {
    err('unit-unknown', `band unit '${step.bandUnit}' is not a unit Beadpath knows`, 'bandUnit');
  }

  if (step.bands.length > GUIDE_LIMITS.maxBands) {
    err('too-many', `at most ${GUIDE_LIMITS.maxBands} bands are allowed, it has ${step.bands.length}`, 'bands');
  }
  const seen = new Set<string>();
  step.bands.forEach((band, index) => {
    if (!ID_PATTERN.test(band.id)) err('bad-id', `band id '${band.id}' must be 1 to 40 lower-case letters, digits or hyphens`, `bands[${index}].id`);
    if (seen.has(band.id)) err('duplicate-id', `two bands share the id '${band.id}'`, `bands[${index}].id`);
    seen.add(band.id);
    if (band.label.trim() === '') err('empty-text', `band ${index + 1}'s label is empty`, `bands[${index}].label`);
  });
  if (step.bands.length > 0) {
    for (const found of bandProblems(step.bands, step.bandUnit)) {
      const path = found.field ? `bands[${found.index}].${found.field}` : `bands[${found.index}]`;
      err(found.code, found.message, path);
    }
  }
}

/** The kind of a calculator output, following the input it takes its unit from when fixed. */
function outputKind(
  output: CalculatorDeclaration['outputs'][number],
  calc: NonNullable<Extract<DraftStep, { kind: 'measure' }>['calculator']>,
  readingKind: QuantityKind | undefined,
): QuantityKind | undefined {
  if (output.unitFrom) {
    if (output.unitFrom === calc.readingInput) return readingKind;
    const fixed = calc.fixedInputs[output.unitFrom];
    if (typeof fixed === 'string') return kindOfUnit(fixed);
    if (fixed) return kindOfUnit(fixed.unit);
    // Filled in by the technician: the kind is only known during the walk.
    return undefined;
  }
  return output.kind !== 'any' && output.kind !== 'verdict' ? output.kind : undefined;
}

function fixedInputProblem(input: InputDeclaration, value: string | { value: number; unit: string }): string | undefined {
  const label = `input '${input.name}' (${input.label.toLowerCase()})`;
  if (input.kind === 'list') return `${label} takes a list of values and cannot be fixed by the guide`;
  if (input.kind === 'choice') {
    const values = (input.choices ?? []).map((choice) => choice.value);
    return typeof value === 'string' && values.includes(value) ? undefined : `${label} must be one of ${orList(values)}`;
  }
  if (input.kind === 'unit') {
    return typeof value === 'string' && kindOfUnit(value) ? undefined : `${label} must be a unit spelling such as "mm"`;
  }
  if (typeof value === 'string') return `${label} must be a number with a unit`;
  const kinds = inputKinds(input);
  if (kinds === undefined) return kindOfUnit(value.unit) ? undefined : `${label}: '${value.unit}' is not a unit Beadpath knows`;
  if (kinds.some((kind) => isUnitOf(value.unit, kind))) return undefined;
  return `${label}: '${value.unit}' is not a ${orList(kinds.map((kind) => KIND_LABELS[kind]))} unit; use ${orList(kinds.flatMap((kind) => UNITS[kind].map((spec) => spec.unit)))}`;
}
