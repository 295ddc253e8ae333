// The demo content in content/: every guide passes the guide validator, every article converts,
// renders and links only to articles and drawings that exist, and the scenario reads as applicator
// inputs. The same check runs as `npm run content:check`.
import { describe, expect, it } from 'vitest';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '@/shared/guides/sample';
import { articleDoc, checkContent, placeholderResolver, readContent, SAMPLE_GUIDE_KEY } from '../../content/lib/content';
import { drawingFileId } from '../../content/lib/load';
import { markdownToDoc } from '../../content/lib/markdown';
import { createRandom, walkPath } from '../../content/lib/history';
import { prepareRichText } from '../../server/lib/rich-text';

const set = readContent();

describe('the demo content', () => {
  it('when checked, then it has no errors', () => {
    const report = checkContent(set);
    expect(report.errors).toEqual([]);
  });

  it('when counted, then it has at least 10 guides besides the demo guide and at least 20 articles', () => {
    expect(set.guides.filter((g) => g.key !== SAMPLE_GUIDE_KEY).length).toBeGreaterThanOrEqual(10);
    expect(set.articles.length).toBeGreaterThanOrEqual(20);
  });

  it('when the demo guide is read from its file, then it is exactly the shared sample', () => {
    const file = set.guides.find((g) => g.key === SAMPLE_GUIDE_KEY)!.guide!;
    expect(file.content).toEqual(SAMPLE_GUIDE);
    const { causes: _causes, ...meta } = file.guide;
    expect(meta).toEqual(SAMPLE_GUIDE_META);
  });

  it('when every article is rendered with the server rich-text pipeline, then each keeps its caution and drawings', () => {
    const resolver = placeholderResolver(set);
    for (const a of set.articles) {
      const converted = articleDoc(a, resolver);
      const rich = prepareRichText(converted.doc);
      expect(rich.html, a.key).toContain('data-caution');
      expect(rich.fileIds.length, a.key).toBe(converted.drawings.length);
    }
  });
});

describe('the content checks catch mistakes', () => {
  it('when an article links to an unknown article or drawing, then the converter reports both', () => {
    const resolver = { drawing: () => undefined, article: () => undefined };
    const out = markdownToDoc('Text with [a link](article:nope).\n\n![A drawing](drawing:missing)\n', resolver);
    expect(out.problems.map((p) => p.message)).toEqual(["Link to unknown article 'nope'", "Unknown drawing 'missing'"]);
  });

  it('when a guide loses its cautions on a hands-on step or links a missing article, then the check fails', () => {
    const broken = structuredClone(set);
    const guide = broken.guides.find((g) => g.key === 'no-flow')!;
    const json = guide.json as { content: { steps: { id: string; cautions: unknown[] }[] } };
    json.content.steps.find((s) => s.id === 'stuck-try')!.cautions = [];
    guide.links!.steps['finding-filter'] = { articles: ['no-such-article'] };
    const errors = checkContent(broken).errors.join('\n');
    expect(errors).toContain("step 'stuck-try': the step sends someone to open or handle the valve");
    expect(errors).toContain("links unknown article 'no-such-article'");
  });

  it('when the demo guide is changed, then the check fails', () => {
    const broken = structuredClone(set);
    const guide = broken.guides.find((g) => g.key === SAMPLE_GUIDE_KEY)!;
    (guide.json as { guide: { title: string } }).guide.title = 'Something else';
    expect(checkContent(broken).errors.join('\n')).toContain('SAMPLE_GUIDE_META');
  });

  it('when a drawing id is derived twice, then it is the same UUID-shaped id, different per organisation', () => {
    expect(drawingFileId(1, 'needle-and-seat')).toBe(drawingFileId(1, 'needle-and-seat'));
    expect(drawingFileId(1, 'needle-and-seat')).not.toBe(drawingFileId(2, 'needle-and-seat'));
    expect(drawingFileId(1, 'needle-and-seat')).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
  });
});

describe('the history hook', () => {
  it('when the same seed is used twice, then the random numbers and the walk paths repeat', () => {
    const bead = set.guides.find((g) => g.key === 'bead-skips')!.guide!.content;
    const a = walkPath(bead, createRandom(42));
    const b = walkPath(bead, createRandom(42));
    expect(a).toEqual(b);
    expect(['finding', 'handoff', 'try']).toContain(a[a.length - 1].kind);
  });

  it('when a path is steered, then it takes the named branches to the named end', () => {
    const bead = set.guides.find((g) => g.key === 'bead-skips')!.guide!.content;
    const steer = (step: { id: string }) => (({ 'skip-pattern': 'random', 'supply-pressure': 'holds', 'flow-check': 'restricted', 'filter-try': true }) as Record<string, string | boolean>)[step.id];
    const path = walkPath(bead, createRandom(1), steer);
    expect(path.map((p) => p.stepId)).toEqual(['skip-pattern', 'supply-pressure', 'flow-check', 'filter-try', 'finding-filter']);
    expect(path[path.length - 1]).toEqual({ stepId: 'finding-filter', kind: 'finding', causeCode: 'filter-blocked' });
  });
});
