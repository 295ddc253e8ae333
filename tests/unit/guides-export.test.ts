// The guide file: exact round trips, every problem of a bad file reported at its path, the
// committed JSON Schema kept in step with the zod schema, and the documented example kept valid.
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { DEFAULT_CAUSES } from '@/shared/tags';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '@/shared/guides/sample';
import { causesUsedBy, exportGuideFile, formatPath, guideFileJsonSchema, parseGuideFile, type FileProblem, type GuideFile } from '@/shared/guides/export';

const EXPORTED_AT = '2025-03-01T10:00:00.000Z';

function sampleFile(): GuideFile {
  return exportGuideFile({
    guide: { ...SAMPLE_GUIDE_META, causes: causesUsedBy(SAMPLE_GUIDE, DEFAULT_CAUSES) },
    content: SAMPLE_GUIDE,
    exportedAt: new Date(EXPORTED_AT),
  });
}

/** A fresh, mutable copy as it would arrive from disk. */
function fromDisk(file: GuideFile): Record<string, any> {
  return JSON.parse(JSON.stringify(file));
}

function problemsOf(json: unknown): FileProblem[] {
  const result = parseGuideFile(json);
  if (result.ok) throw new Error('expected the file to be refused');
  return result.problems;
}

function readDoc(name: string): string {
  return readFileSync(fileURLToPath(new URL(`../../docs/${name}`, import.meta.url)), 'utf8');
}

describe('exporting and importing a guide file', () => {
  it('when the sample guide is exported, written, read and exported again, then the two files are byte for byte equal', () => {
    const file = sampleFile();
    const text = JSON.stringify(file, null, 2);
    const parsed = parseGuideFile(JSON.parse(text));
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems, null, 1));
    expect(parsed.file).toStrictEqual(file);
    const again = exportGuideFile({ guide: parsed.file.guide, content: parsed.file.content, exportedAt: parsed.file.exportedAt });
    expect(again).toStrictEqual(file);
    expect(JSON.stringify(again, null, 2)).toBe(text);
  });

  it('when a guide is exported, then the file carries the format, its version and only the causes its findings use', () => {
    const file = sampleFile();
    expect(file.format).toBe('beadpath-guide');
    expect(file.formatVersion).toBe(1);
    expect(file.exportedAt).toBe(EXPORTED_AT);
    const used = new Set(SAMPLE_GUIDE.steps.flatMap((step) => (step.kind === 'finding' ? [step.causeCode] : [])));
    expect(new Set(file.guide.causes?.map((cause) => cause.code))).toEqual(used);
    expect(file.guide.causes?.find((cause) => cause.code === 'seat-worn')?.label).toBe('Seat worn or damaged');
  });

  it('when an optional field is present but undefined, then the export leaves it out, as JSON would', () => {
    const file = exportGuideFile({ guide: { ...SAMPLE_GUIDE_META, summary: undefined }, content: SAMPLE_GUIDE, exportedAt: EXPORTED_AT });
    expect('summary' in file.guide).toBe(false);
    expect('causes' in file.guide).toBe(false);
  });
});

describe('reading a malformed guide file', () => {
  it('when the input is not an object, then that one problem is reported for the whole file', () => {
    expect(problemsOf('hello')).toEqual([{ path: '', message: 'A guide file must be a JSON object' }]);
    expect(problemsOf([])).toEqual([{ path: '', message: 'A guide file must be a JSON object' }]);
  });

  it('when the file is of a later format version, then the message says which version this Beadpath reads', () => {
    const json = fromDisk(sampleFile());
    json.formatVersion = 2;
    expect(problemsOf(json)).toEqual([{ path: 'formatVersion', message: 'This file is format version 2; this Beadpath reads version 1' }]);
  });

  it('when the file has several shape problems, then each is reported at its own path', () => {
    const json = fromDisk(sampleFile());
    json.format = 'something-else';
    json.exportedAt = 'yesterday';
    json.guide.title = '';
    json.guide.extra = true;
    json.content.steps[2].colour = 'red';
    json.content.steps[3].bands[0].min = 'low';
    json.content.steps[10].remedy = 'Fix it';
    const problems = problemsOf(json);
    expect(problems.map((p) => p.path)).toEqual(['format', 'exportedAt', 'guide.title', 'guide.extra', 'content.steps[2].colour', 'content.steps[3].bands[0].min', 'content.steps[10].remedy']);
    expect(problems[0].message).toContain('not a Beadpath guide file');
    expect(problems[2].message).toBe('Guide title must not be empty');
    expect(problems[3].message).toBe("Unknown field 'extra'");
    expect(problems[5].message).toBe('Band lower limit must be a finite number or null');
    expect(problems[6].message).toBe('Remedy must be a list');
  });

  it('when the steps are well formed but the guide is not, then every validator error is reported at its path in the file', () => {
    const json = fromDisk(sampleFile());
    json.content.steps[0].choices[1].next = 'nowhere';
    json.content.steps[1].bands[1].min = 6;
    json.content.steps[10].causeCode = 'gremlins';
    json.content.steps[19].message = '';
    json.guide.causes.push({ ...json.guide.causes[0] });
    const problems = problemsOf(json);
    const at = (path: string) => problems.filter((p) => p.path === path).map((p) => p.message);
    expect(at('content.steps[0].choices[1].next')).toEqual(["In Ask step 'drip-when', choice 'It seeps steadily between shots' points at step 'nowhere', which does not exist"]);
    expect(at('content.steps[1].bands[1].min')[0]).toContain("Gap between bands 'normal' and 'high'");
    expect(at('content.steps[10].causeCode')[0]).toContain("'gremlins'");
    expect(at('content.steps[19].message')[0]).toContain('what to tell them is empty');
    expect(at(`guide.causes[${json.guide.causes.length - 1}].code`)[0]).toContain('defined twice');
    // The step the broken choice used to reach is still reached through 'short-nozzle', so nothing else is reported.
    expect(problems).toHaveLength(5);
  });

  it('when a finding uses a cause the file does not define but the receiving organisation knows, then it is accepted', () => {
    const json = fromDisk(sampleFile());
    json.guide.causes = json.guide.causes.filter((cause: { code: string }) => cause.code !== 'seat-worn');
    expect(problemsOf(json).map((p) => p.path)).toEqual(['content.steps[16].causeCode']);
    expect(parseGuideFile(json, { causeCodes: ['seat-worn'] }).ok).toBe(true);
  });

  it('when a measure names a calculator Beadpath does not have, then import refuses it', () => {
    const json = fromDisk(sampleFile());
    json.content.steps[4].calculator.id = 'crystal-ball';
    expect(problemsOf(json)).toEqual([{ path: 'content.steps[4].calculator.id', message: "Measure step 'coil-resistance': there is no calculator 'crystal-ball'" }]);
  });

  it('when paths hold odd keys, then they are quoted', () => {
    expect(formatPath(['content', 'steps', 3, 'calculator', 'fixedInputs', 'odd key'])).toBe('content.steps[3].calculator.fixedInputs["odd key"]');
  });
});

describe('the documented format', () => {
  it('when the JSON Schema is generated from the zod schema, then it equals the committed docs/guide-format.schema.json', () => {
    const committed = JSON.parse(readDoc('guide-format.schema.json'));
    expect(committed).toEqual(guideFileJsonSchema());
  });

  it('when the JSON Schema is read, then it pins the format name and version and refuses unknown fields', () => {
    const schema = guideFileJsonSchema() as { properties: Record<string, { const?: unknown }>; additionalProperties: unknown; required: string[] };
    expect(schema.properties.format.const).toBe('beadpath-guide');
    expect(schema.properties.formatVersion.const).toBe(1);
    expect(schema.additionalProperties).toBe(false);
    expect(schema.required).toEqual(['format', 'formatVersion', 'exportedAt', 'guide', 'content']);
  });

  it('when the example in docs/guide-format.md is imported, then it is a valid guide file', () => {
    const markdown = readDoc('guide-format.md');
    const example = /```json\n([\s\S]*?)\n```/.exec(markdown);
    expect(example).not.toBeNull();
    const result = parseGuideFile(JSON.parse(example?.[1] ?? ''));
    expect(result.ok ? [] : result.problems).toEqual([]);
  });
});
