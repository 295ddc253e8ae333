// The import boundaries and correctness rules of eslint.config.ts hold over the whole tree
// (the same check as `npm run lint`), so a feature importing another fails the test run.
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

describe('lint', () => {
  it('when the whole project is linted, then ESLint reports no errors', async () => {
    const eslint = new ESLint({ cwd: process.cwd() });
    const results = await eslint.lintFiles(['.']);
    const errors = results.flatMap((r) => r.messages.filter((m) => m.severity === 2).map((m) => `${r.filePath.replace(`${process.cwd()}/`, '')}:${m.line} ${m.ruleId}: ${m.message}`));
    expect(errors).toEqual([]);
  }, 180_000);
});
