// QR labels for applicators, laid out on common A4 and US Letter label sheets. Each code opens the
// applicator's page, where a technician starts a walk with the valve already recorded.
import { useEffect, useState } from 'react';
import { Link, useSearchParams } from 'react-router';
import QRCode from 'qrcode';
import type { ApplicatorListItem } from '@/shared/schemas/assets';
import { errorMessage } from '@/lib/api-client';
import { Button } from '@/components/ui/button';
import { EmptyState, ListSkeleton, Notice } from '@/components/ui/feedback';
import { SelectField } from '@/components/ui/field';
import { PageHeader } from '@/components/ui/page';
import { useApplicators, useLines, useSites } from '../api/assets';

interface SheetLayout {
  label: string;
  page: 'A4' | 'letter';
  unit: 'mm' | 'in';
  pageW: number;
  pageH: number;
  cols: number;
  rows: number;
  w: number;
  h: number;
  left: number;
  top: number;
  gapX: number;
  gapY: number;
}

// Label positions of widely sold blank sheets, measured from the page's top-left corner.
export const LAYOUTS: Record<string, SheetLayout> = {
  'a4-24': { label: 'A4 · 24 per sheet (3 × 8, 70 × 37 mm)', page: 'A4', unit: 'mm', pageW: 210, pageH: 297, cols: 3, rows: 8, w: 70, h: 37, left: 0, top: 0.5, gapX: 0, gapY: 0 },
  'a4-14': { label: 'A4 · 14 per sheet (2 × 7, 99.1 × 38.1 mm)', page: 'A4', unit: 'mm', pageW: 210, pageH: 297, cols: 2, rows: 7, w: 99.1, h: 38.1, left: 4.65, top: 15.15, gapX: 2.5, gapY: 0 },
  'letter-30': {
    label: 'US Letter · 30 per sheet (3 × 10, 2⅝ × 1 in)',
    page: 'letter',
    unit: 'in',
    pageW: 8.5,
    pageH: 11,
    cols: 3,
    rows: 10,
    w: 2.625,
    h: 1,
    left: 0.1875,
    top: 0.5,
    gapX: 0.125,
    gapY: 0,
  },
  'letter-10': { label: 'US Letter · 10 per sheet (2 × 5, 4 × 2 in)', page: 'letter', unit: 'in', pageW: 8.5, pageH: 11, cols: 2, rows: 5, w: 4, h: 2, left: 0.15625, top: 0.5, gapX: 0.1875, gapY: 0 },
};

function useQrCodes(urls: string[]) {
  const [codes, setCodes] = useState<Record<string, string>>({});
  const key = urls.join('|');
  useEffect(() => {
    let live = true;
    Promise.all(urls.map(async (u) => [u, await QRCode.toString(u, { type: 'svg', margin: 0, errorCorrectionLevel: 'M' })] as const)).then((pairs) => {
      if (live) setCodes(Object.fromEntries(pairs.map(([u, svg]) => [u, `data:image/svg+xml;charset=utf-8,${encodeURIComponent(svg)}`])));
    });
    return () => {
      live = false;
    };
    // The joined key stands for the list: a new array with the same addresses needs no new codes.
  }, [key]);
  return codes;
}

function Label({ a, layout, qr }: { a: ApplicatorListItem; layout: SheetLayout; qr?: string }) {
  const u = layout.unit;
  const pad = layout.h * 0.09;
  const side = Math.min(layout.h - 2 * pad, layout.w * 0.38);
  const textWidth = layout.w - side - 3 * pad;
  // Long tags shrink to fit one line; a bold sans glyph is about 0.62 em wide.
  const tagSize = Math.min(layout.h * 0.2, textWidth / (0.62 * Math.max(4, a.tag.length)));
  const small = layout.h * 0.085;
  return (
    <div className="flex h-full items-center overflow-hidden" style={{ padding: `${pad}${u}`, gap: `${pad}${u}` }} data-label={a.tag}>
      {qr ? (
        <img src={qr} alt={`QR code for ${a.tag}`} style={{ width: `${side}${u}`, height: `${side}${u}` }} />
      ) : (
        <div style={{ width: `${side}${u}`, height: `${side}${u}` }} className="bg-paper-sunk" />
      )}
      <div className="min-w-0 flex-1 font-sans leading-tight text-black">
        <p className="whitespace-nowrap font-bold" style={{ fontSize: `${tagSize}${u}` }}>
          {a.tag}
        </p>
        <p className="line-clamp-2" style={{ fontSize: `${small}${u}` }}>
          {a.lineName}
        </p>
        <p className="truncate" style={{ fontSize: `${small}${u}` }}>
          {a.siteName}
        </p>
        <p style={{ fontSize: `${small * 0.8}${u}` }}>Scan to open in Beadpath</p>
      </div>
    </div>
  );
}

export function LabelsPage() {
  const [params] = useSearchParams();
  const preset = params.get('ids');
  const [siteId, setSiteId] = useState('');
  const [lineId, setLineId] = useState('');
  const list = useApplicators({ siteId, lineId, status: 'in-use' });
  const sites = useSites();
  const lines = useLines();
  const [chosen, setChosen] = useState<Set<number> | null>(preset ? new Set(preset.split(',').map(Number)) : null);
  const [layoutKey, setLayoutKey] = useState(() => (navigator.language === 'en-US' ? 'letter-30' : 'a4-24'));
  const [skip, setSkip] = useState(0);
  const layout = LAYOUTS[layoutKey];
  const perSheet = layout.cols * layout.rows;

  const all = list.data?.applicators ?? [];
  const selected = chosen ? all.filter((a) => chosen.has(a.id)) : all;
  const origin = window.location.origin;
  const codes = useQrCodes(selected.map((a) => `${origin}/applicators/${a.id}`));
  const slots: (ApplicatorListItem | null)[] = [...Array(skip).fill(null), ...selected];
  const sheets: (ApplicatorListItem | null)[][] = [];
  for (let i = 0; i < slots.length; i += perSheet) sheets.push(slots.slice(i, i + perSheet));

  const toggle = (id: number) => {
    const next = new Set(chosen ?? all.map((a) => a.id));
    if (next.has(id)) next.delete(id);
    else next.add(id);
    setChosen(next);
  };

  const u = layout.unit;
  return (
    <div>
      {/* The sheet is printed edge to edge; the browser's own margins would shift every label. */}
      <style>{`@media print { @page { size: ${layout.page === 'A4' ? 'A4' : 'letter'}; margin: 0; } body { background: white; } }`}</style>
      <div className="no-print">
        <Link to="/applicators" className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
          ← Applicators
        </Link>
        <PageHeader
          title="Print QR labels"
          lead="Each code opens the applicator’s page on a phone, where one tap on a symptom starts a walk with the valve recorded. Print at 100 % (no “fit to page”) on the label sheet chosen below."
          actions={
            <Button onClick={() => window.print()} disabled={!selected.length}>
              Print {selected.length} label{selected.length === 1 ? '' : 's'}
            </Button>
          }
        />
        <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
          <SelectField
            label="Label sheet"
            value={layoutKey}
            onChange={(e) => {
              setLayoutKey(e.target.value);
              setSkip(0);
            }}
          >
            {Object.entries(LAYOUTS).map(([k, l]) => (
              <option key={k} value={k}>
                {l.label}
              </option>
            ))}
          </SelectField>
          <SelectField label="Start at label" value={String(skip)} onChange={(e) => setSkip(Number(e.target.value))}>
            {Array.from({ length: perSheet }, (_, i) => (
              <option key={i} value={i}>
                {i === 0 ? '1 (a new sheet)' : `${i + 1} (skip ${i} used)`}
              </option>
            ))}
          </SelectField>
          <SelectField
            label="Site"
            value={siteId}
            onChange={(e) => {
              setSiteId(e.target.value);
              setLineId('');
              setChosen(null);
            }}
          >
            <option value="">All sites</option>
            {(sites.data ?? []).map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </SelectField>
          <SelectField
            label="Line"
            value={lineId}
            onChange={(e) => {
              setLineId(e.target.value);
              setChosen(null);
            }}
          >
            <option value="">All lines</option>
            {(lines.data ?? [])
              .filter((l) => !siteId || String(l.siteId) === siteId)
              .map((l) => (
                <option key={l.id} value={l.id}>
                  {l.siteName} · {l.name}
                </option>
              ))}
          </SelectField>
        </div>
        <p className="mt-2 text-sm text-ink-soft">The codes point to {origin}. Print from the address your colleagues’ phones reach Beadpath at.</p>

        {list.isPending ? (
          <ListSkeleton label="Loading applicators" />
        ) : list.isError ? (
          <Notice tone="error" title="The applicators could not be loaded">
            {errorMessage(list.error)}
          </Notice>
        ) : all.length === 0 ? (
          <EmptyState title="No applicator to label">Add applicators first, or choose another site or line.</EmptyState>
        ) : (
          <details className="mt-4" open={all.length <= 30}>
            <summary className="min-h-11 cursor-pointer font-semibold">
              Applicators to print ({selected.length} of {all.length})
            </summary>
            <div className="mb-2 flex gap-2">
              <Button variant="quiet" onClick={() => setChosen(null)}>
                All
              </Button>
              <Button variant="quiet" onClick={() => setChosen(new Set())}>
                None
              </Button>
            </div>
            <ul className="grid gap-1 sm:grid-cols-2 lg:grid-cols-3">
              {all.map((a) => (
                <li key={a.id}>
                  <label className="flex min-h-11 cursor-pointer items-center gap-3 rounded-md border border-rule bg-paper-raised px-3">
                    <input type="checkbox" className="size-5" checked={!chosen || chosen.has(a.id)} onChange={() => toggle(a.id)} />
                    <span>
                      <span className="font-semibold">{a.tag}</span>{' '}
                      <span className="text-sm text-ink-soft">
                        {a.siteName} · {a.lineName}
                      </span>
                    </span>
                  </label>
                </li>
              ))}
            </ul>
          </details>
        )}
        {selected.length ? (
          <h2 className="mb-2 mt-6 text-xl font-semibold">
            Preview ({sheets.length} sheet{sheets.length === 1 ? '' : 's'})
          </h2>
        ) : null}
      </div>

      <div className="overflow-x-auto pb-4 print:overflow-visible print:p-0">
        {selected.length
          ? sheets.map((sheet, si) => (
              <div
                key={si}
                className="label-sheet relative mb-6 bg-white shadow-md ring-1 ring-rule print:mb-0 print:shadow-none print:ring-0"
                style={{ width: `${layout.pageW}${u}`, height: `${layout.pageH}${u}`, breakAfter: si < sheets.length - 1 ? 'page' : 'auto', overflow: 'hidden' }}
              >
                {sheet.map((a, i) => {
                  const col = i % layout.cols;
                  const row = Math.floor(i / layout.cols);
                  return (
                    <div
                      key={i}
                      className="absolute outline-1 outline-dashed outline-rule print:outline-none"
                      style={{
                        left: `${layout.left + col * (layout.w + layout.gapX)}${u}`,
                        top: `${layout.top + row * (layout.h + layout.gapY)}${u}`,
                        width: `${layout.w}${u}`,
                        height: `${layout.h}${u}`,
                      }}
                    >
                      {a ? <Label a={a} layout={layout} qr={codes[`${origin}/applicators/${a.id}`]} /> : null}
                    </div>
                  );
                })}
              </div>
            ))
          : null}
      </div>
    </div>
  );
}
