// CSV import, one list at a time: choose what the file holds, see its columns and download the
// template, preview every row's problems, then import all rows or only the valid ones.
import { useEffect, useRef, useState } from 'react';
import { Link } from 'react-router';
import { ASSET_LIMITS, CSV_COLUMNS, IMPORT_KIND_LABELS, IMPORT_KINDS, type ImportKind, type ImportPreview, type ImportProblem, type ImportResult } from '@/shared/schemas/assets';
import { ApiError, errorMessage } from '@/lib/api-client';
import { Button, buttonClass } from '@/components/ui/button';
import { Notice, ProgressBar, StageList } from '@/components/ui/feedback';
import { Card, PageHeader } from '@/components/ui/page';
import { useCommitImport, usePreviewImport } from '../api/assets';
import { formatInteger } from '@/lib/format';

const MAX_MB = 40;
const DELIMITER_WORDS: Record<string, string> = { ',': 'commas', ';': 'semicolons', '\t': 'tabs', '|': 'vertical bars' };

function Problems({ problems, more }: { problems: ImportProblem[]; more: number }) {
  return (
    <div className="max-h-96 overflow-y-auto rounded-md border border-rule">
      <table className="w-full text-left text-sm">
        <thead className="sticky top-0 bg-paper-sunk">
          <tr>
            <th className="px-2 py-1">Row</th>
            <th className="px-2 py-1">Column</th>
            <th className="px-2 py-1">Problem</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-rule">
          {problems.map((p, i) => (
            <tr key={i} data-problem-row={p.row ?? ''}>
              <td className="tabular px-2 py-1 align-top">{p.row ?? '—'}</td>
              <td className="px-2 py-1 align-top">{p.column ?? 'whole row'}</td>
              <td className="px-2 py-1">{p.message}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {more ? <p className="px-2 py-1 text-sm text-ink-soft">…and {formatInteger(more)} more problems not listed.</p> : null}
    </div>
  );
}

export function ImportPage() {
  const [kind, setKind] = useState<ImportKind>('applicators');
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [fileProblem, setFileProblem] = useState<string | null>(null);
  const [result, setResult] = useState<ImportResult | null>(null);
  const input = useRef<HTMLInputElement>(null);
  const next = useRef<HTMLDivElement>(null);
  // Share of the file sent for the running preview or import (1: the server has it and is working).
  const [sent, setSent] = useState<number>(0);
  const preview = usePreviewImport();
  const commit = useCommitImport();
  const p: ImportPreview | undefined = preview.data;
  // The next step appears below a long column list; bring it into view.
  useEffect(() => {
    if (p || result) next.current?.scrollIntoView({ behavior: 'smooth', block: 'start' });
  }, [p, result]);

  const reset = () => {
    setFile(null);
    setFileProblem(null);
    setResult(null);
    preview.reset();
    commit.reset();
  };

  async function choose(f: File) {
    reset();
    if (f.size > MAX_MB * 1024 * 1024) {
      setFileProblem(`The file is larger than ${MAX_MB} MB. Split it into smaller files.`);
      return;
    }
    const text = await f.text();
    // A spreadsheet's "CSV" in a legacy code page decodes with replacement marks; say so before sending.
    if (text.includes('\uFFFD')) {
      setFileProblem('This file is not saved as UTF-8 text, so letters such as é or symbols such as ° would be garbled. In your spreadsheet, save it as “CSV UTF-8” and choose it again.');
      return;
    }
    setFile({ name: f.name, text });
    setSent(0);
    preview.mutate({ kind, csv: text, onProgress: setSent });
  }

  const fileError = preview.error instanceof ApiError ? preview.error : null;
  const commitError = commit.error instanceof ApiError ? commit.error : null;
  const commitProblems = (commitError?.details?.problems as ImportProblem[] | undefined) ?? null;

  return (
    <div className="mx-auto max-w-5xl space-y-5">
      <Link to="/applicators" className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
        ← Applicators
      </Link>
      <PageHeader
        title="Import from CSV"
        lead="Import sites first, then lines, your own fields, applicators and last counter readings: each list refers to the ones before it. Nothing is imported until every row is valid, unless you choose to import the valid rows only."
      />

      <Card>
        <fieldset>
          <legend className="mb-2 font-semibold">1. What does the file hold?</legend>
          <div className="flex flex-wrap gap-2">
            {IMPORT_KINDS.map((k) => (
              <label
                key={k}
                className={`flex min-h-11 cursor-pointer items-center gap-2 rounded-full border px-4 ${kind === k ? 'border-amber bg-amber-wash font-semibold text-amber-deep' : 'border-rule-strong bg-paper-raised'}`}
              >
                <input
                  type="radio"
                  name="kind"
                  className="sr-only"
                  checked={kind === k}
                  onChange={() => {
                    setKind(k);
                    reset();
                  }}
                />
                {IMPORT_KIND_LABELS[k]}
              </label>
            ))}
          </div>
        </fieldset>
        <details className="mt-4" open={!file}>
          <summary className="min-h-11 cursor-pointer font-semibold">Columns of the {IMPORT_KIND_LABELS[kind].toLowerCase()} file</summary>
          <div className="overflow-x-auto">
            <table className="mt-2 w-full text-left text-sm">
              <thead>
                <tr className="border-b border-rule">
                  <th className="py-1 pr-3">Header</th>
                  <th className="py-1 pr-3">Required</th>
                  <th className="py-1">What goes in it</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-rule">
                {CSV_COLUMNS[kind].map((c) => (
                  <tr key={c.key}>
                    <td className="py-1 pr-3 font-semibold">{c.header}</td>
                    <td className="py-1 pr-3">{c.required ? 'yes' : ''}</td>
                    <td className="py-1 text-ink-soft">{c.help}</td>
                  </tr>
                ))}
                {kind === 'applicators' ? (
                  <tr>
                    <td className="py-1 pr-3 font-semibold">Your own fields</td>
                    <td />
                    <td className="py-1 text-ink-soft">One column each, headed with the field’s name (and unit), as in the template</td>
                  </tr>
                ) : null}
              </tbody>
            </table>
          </div>
          <p className="mt-2 text-sm text-ink-soft">
            Columns may come in any order and headers ignore case. Commas, semicolons or tabs between columns; dates as YYYY-MM-DD; yes or no for yes/no columns; up to{' '}
            {formatInteger(ASSET_LIMITS.importRows)} rows per file.
          </p>
        </details>
        <a href={`/api/applicators/import/${kind}/template`} download className={buttonClass('secondary', 'mt-3')}>
          Download the template
        </a>
      </Card>

      <Card>
        <p className="mb-2 font-semibold">2. Choose the file</p>
        <Button onClick={() => input.current?.click()} busy={preview.isPending}>
          {file ? 'Choose another file' : 'Choose a CSV file'}
        </Button>
        <input
          ref={input}
          type="file"
          accept=".csv,text/csv,text/plain"
          className="hidden"
          aria-label="CSV file to import"
          onChange={(e) => {
            const f = e.target.files?.[0];
            e.target.value = '';
            if (f) void choose(f);
          }}
        />
        {file ? (
          <p className="mt-2 text-sm">
            File: <span className="font-semibold">{file.name}</span>
          </p>
        ) : null}
        {preview.isPending ? (
          <div className="mt-3 space-y-2" data-import-progress="preview">
            <StageList label="Checking the file" stages={['Read the file on this device', 'Send it', 'Check every row']} current={sent < 1 ? 1 : 2} />
            <ProgressBar label={sent < 1 ? 'Sending the file' : 'Checking every row'} value={sent < 1 ? sent : null} />
          </div>
        ) : null}
        {fileProblem ? (
          <div className="mt-3">
            <Notice tone="error" title="The file cannot be imported">
              {fileProblem}
            </Notice>
          </div>
        ) : null}
        {fileError ? (
          <div className="mt-3">
            <Notice tone="error" title="The file cannot be imported">
              {fileError.message}
            </Notice>
          </div>
        ) : preview.isError ? (
          <div className="mt-3">
            <Notice tone="error" title={errorMessage(preview.error)} />
          </div>
        ) : null}
      </Card>

      <div ref={next} className="scroll-mt-20" />
      {p && file && !result ? (
        <Card>
          <p className="mb-2 font-semibold">3. Check and import</p>
          <p>
            {formatInteger(p.totalRows)} row{p.totalRows === 1 ? '' : 's'} read (columns separated by {DELIMITER_WORDS[p.delimiter] ?? p.delimiter}):{' '}
            <span className="font-semibold text-fixed">{formatInteger(p.validRows)} ready</span>
            {p.invalidRows ? (
              <>
                , <span className="font-semibold text-danger">{formatInteger(p.invalidRows)} with problems</span>
              </>
            ) : null}
            .
          </p>
          {p.sample.length ? (
            <div className="mt-3 overflow-x-auto rounded-md border border-rule">
              <table className="w-full text-left text-sm">
                <caption className="px-2 py-1 text-left text-ink-soft">The first rows as read</caption>
                <thead className="bg-paper-sunk">
                  <tr>
                    <th className="px-2 py-1">Row</th>
                    {p.columns.map((c) => (
                      <th key={c} className="whitespace-nowrap px-2 py-1">
                        {c}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody className="divide-y divide-rule">
                  {p.sample.map((r) => (
                    <tr key={r.row} className={r.ok ? '' : 'bg-danger-wash'}>
                      <td className="tabular px-2 py-1">
                        {r.row}
                        {r.ok ? '' : ' ✗'}
                      </td>
                      {p.columns.map((c) => (
                        <td key={c} className="whitespace-nowrap px-2 py-1">
                          {r.values[c]}
                        </td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          ) : null}
          {p.problems.length ? (
            <div className="mt-4">
              <p className="mb-1 font-semibold">Problems, row by row (the header is row 1)</p>
              <Problems problems={p.problems} more={p.moreProblems} />
            </div>
          ) : null}
          {commitError ? (
            <div className="mt-3">
              <Notice tone="error" title={commitError.message} />
              {commitProblems ? (
                <div className="mt-2">
                  <Problems problems={commitProblems} more={Number(commitError.details?.moreProblems ?? 0)} />
                </div>
              ) : null}
            </div>
          ) : commit.isError ? (
            <div className="mt-3">
              <Notice tone="error" title={errorMessage(commit.error)} />
            </div>
          ) : null}
          <div className="mt-4 flex flex-wrap gap-2">
            <Button
              disabled={p.invalidRows > 0 || p.validRows === 0}
              busy={commit.isPending && commit.variables?.mode === 'all-or-nothing'}
              onClick={() => {
                setSent(0);
                commit.mutate({ kind, csv: file.text, mode: 'all-or-nothing', onProgress: setSent }, { onSuccess: setResult });
              }}
            >
              Import all {formatInteger(p.totalRows)} rows
            </Button>
            {p.invalidRows > 0 && p.validRows > 0 ? (
              <Button
                variant="secondary"
                busy={commit.isPending && commit.variables?.mode === 'valid-only'}
                onClick={() => {
                  setSent(0);
                  commit.mutate({ kind, csv: file.text, mode: 'valid-only', onProgress: setSent }, { onSuccess: setResult });
                }}
              >
                Import the {formatInteger(p.validRows)} valid rows only
              </Button>
            ) : null}
          </div>
          {commit.isPending ? (
            <div className="mt-3 space-y-2" data-import-progress="commit">
              <StageList
                label="Importing"
                stages={['Send the file', commit.variables?.mode === 'valid-only' ? 'Import the valid rows' : 'Import every row, or none if one fails']}
                current={sent < 1 ? 0 : 1}
              />
              <ProgressBar label={sent < 1 ? 'Sending the file' : 'Importing the rows'} value={sent < 1 ? sent : null} />
            </div>
          ) : null}
          {p.invalidRows > 0 ? <p className="mt-2 text-sm text-ink-soft">Fix the rows above in your file and choose it again, or import the valid rows only and deal with the rest later.</p> : null}
        </Card>
      ) : null}

      {result ? (
        <Card>
          <Notice tone="ok" title={`Imported ${formatInteger(result.imported)} row${result.imported === 1 ? '' : 's'} of ${IMPORT_KIND_LABELS[result.kind].toLowerCase()}`}>
            {result.skippedRows ? `${formatInteger(result.skippedRows)} row${result.skippedRows === 1 ? ' was' : 's were'} skipped; they are listed below.` : 'Every row was imported.'}
          </Notice>
          {result.skipped.length ? (
            <div className="mt-3">
              <Problems problems={result.skipped} more={0} />
            </div>
          ) : null}
          <div className="mt-3 flex flex-wrap gap-2">
            <Button variant="secondary" onClick={reset}>
              Import another file
            </Button>
            <Link className={buttonClass('quiet')} to="/applicators">
              See the applicators
            </Link>
          </div>
        </Card>
      ) : null}
    </div>
  );
}
