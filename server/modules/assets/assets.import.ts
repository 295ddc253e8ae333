// CSV import and export of sites, lines, the organisation's own fields, applicators and counter
// readings. Every row is checked with the same zod schema as the forms, then against the database
// and the rows before it (unknown site or line, duplicate tag, counter going backwards); the commit
// re-checks inside its transaction and writes all rows, or only the valid ones when asked.
import type { Knex } from 'knex';
import type { ZodError, ZodType } from 'zod';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import {
  ACTUATION_LABELS,
  ACTUATIONS,
  APPLICATOR_STATUS_LABELS,
  APPLICATOR_STATUSES,
  ApplicatorInput,
  ASSET_LIMITS,
  COIL_DRIVE_LABELS,
  COIL_DRIVES,
  CSV_COLUMNS,
  customFieldHeader,
  FIELD_TYPE_LABELS,
  FIELD_TYPES,
  FieldInput,
  LineInput,
  NEEDLE_TIP_LABELS,
  NEEDLE_TIPS,
  ReadingInput,
  SERVICE_ACTION_LABELS,
  SiteInput,
  type CustomValue,
  type FieldView,
  type ImportKind,
  type ImportMode,
  type ImportPreview,
  type ImportProblem,
  type ImportResult,
} from '../../../src/shared/schemas/assets';
import { AppError } from '../../lib/app-error';
import { booleanCell, choiceCell, dateCell, headerKey, integerCell, numberCell, parseCsv, toCsv, type Cell, type CsvRow, type CsvValue, type ParsedCsv } from './assets.csv';
import { byDate, readingProblem, type ReadingPoint } from './assets.counters';
import { assetsRepository as repo } from './assets.repository';
import { applicatorColumns, checkCustom, standardFieldClash } from './assets.service';
import { audit } from '../../lib/audit';

interface Checked {
  row: number;
  cells: Record<string, string>;
  problems: ImportProblem[];
  /** The row as it will be inserted, once every check passed. */
  insert?: Record<string, unknown>;
}

const lower = (s: string) => s.trim().toLowerCase();

/** Collects a row's problems, one per column, in the words of the file's own header. */
class RowCheck {
  readonly problems: ImportProblem[] = [];
  private readonly seen = new Set<string>();
  constructor(
    readonly csv: CsvRow,
    private readonly headerOf: (key: string) => string,
  ) {
    this.problems.push(...csv.problems);
  }
  fail(key: string | null, message: string) {
    const column = key === null ? null : this.headerOf(key);
    const id = column ?? '(row)';
    if (this.seen.has(id)) return;
    this.seen.add(id);
    this.problems.push({ row: this.csv.row, column, message });
  }
  cell<T>(key: string, parsed: Cell<T>): T | undefined {
    if ('error' in parsed) {
      this.fail(key, parsed.error);
      return undefined;
    }
    return parsed.value;
  }
  zod<S extends ZodType>(schema: S, value: unknown): import('zod').output<S> | undefined {
    const res = schema.safeParse(value);
    if (res.success) return res.data;
    for (const issue of (res.error as ZodError).issues) {
      const [top, sub] = issue.path.map(String);
      this.fail(top === 'custom' && sub ? `custom:${sub}` : (top ?? null), issue.message);
    }
    return undefined;
  }
  get ok() {
    return this.problems.length === 0;
  }
}

function fluidAliases(families: { slug: string; label: string; active: boolean }[]) {
  const map = new Map<string, string>();
  for (const f of families.filter((x) => x.active)) {
    map.set(headerKey(f.slug), f.slug);
    map.set(headerKey(f.label), f.slug);
  }
  return map;
}

function customCell(f: FieldView, text: string, decimalComma: boolean): Cell<CustomValue> {
  if (!text) return { value: null };
  if (f.type === 'number') return numberCell(text, { decimalComma, unit: f.unit ?? undefined });
  if (f.type === 'yes-no') return booleanCell(text);
  if (f.type === 'date') return dateCell(text, f.name);
  return { value: text };
}

export function createAssetsImport(deps: { db: Knex }) {
  const { db } = deps;

  async function parseFor(trx: Knex, user: SessionUser, kind: ImportKind, text: string): Promise<{ parsed: ParsedCsv; fields: FieldView[] }> {
    const fields = kind === 'applicators' ? await repo.fields(trx, user.organisationId) : [];
    const extra = fields.map((f) => ({ key: `custom:${f.id}`, header: customFieldHeader(f), aliases: [f.name] }));
    return { parsed: parseCsv(text, CSV_COLUMNS[kind], extra), fields };
  }

  async function check(trx: Knex, user: SessionUser, kind: ImportKind, parsed: ParsedCsv, fields: FieldView[]): Promise<Checked[]> {
    const org = user.organisationId;
    const labelOf = new Map<string, string>([
      ...CSV_COLUMNS[kind].map((c) => [c.key, c.header] as [string, string]),
      ...fields.map((f) => [`custom:${f.id}`, customFieldHeader(f)] as [string, string]),
    ]);
    const headerOf = (key: string) => parsed.headers[key] ?? labelOf.get(key) ?? key;
    const dc = parsed.decimalComma;
    const out: Checked[] = [];
    const finish = (c: RowCheck, insert?: Record<string, unknown>) => out.push({ row: c.csv.row, cells: c.csv.cells, problems: c.problems, insert: c.ok ? insert : undefined });

    const sites = await repo.sites(trx, org);
    const siteByName = new Map(sites.map((s) => [lower(s.name), s]));
    const siteOf = (c: RowCheck) => {
      const name = c.csv.cells.site ?? '';
      if (!name) return (c.fail('site', 'Site is required'), undefined);
      const s = siteByName.get(lower(name));
      if (!s) c.fail('site', `No site '${name}' in Beadpath yet; import or add the site first`);
      return s;
    };

    if (kind === 'sites') {
      const firstRow = new Map<string, number>();
      for (const csv of parsed.rows) {
        const c = new RowCheck(csv, headerOf);
        const v = c.zod(SiteInput, { name: csv.cells.name ?? '', address: csv.cells.address, contact: csv.cells.contact });
        if (v) {
          const k = lower(v.name);
          if (siteByName.has(k)) c.fail('name', `Site '${v.name}' already exists`);
          else if (firstRow.has(k)) c.fail('name', `Site '${v.name}' appears twice in the file (first on row ${firstRow.get(k)})`);
          else firstRow.set(k, csv.row);
        }
        finish(c, v && { organisation_id: org, name: v.name, address: v.address, contact: v.contact });
      }
      return out;
    }

    if (kind === 'lines') {
      const existing = new Set((await repo.lines(trx, org)).map((l) => `${l.siteId}:${lower(l.name)}`));
      const firstRow = new Map<string, number>();
      for (const csv of parsed.rows) {
        const c = new RowCheck(csv, headerOf);
        const site = siteOf(c);
        const v = c.zod(LineInput, { siteId: site?.id ?? 1, name: csv.cells.name ?? '', area: csv.cells.area, contact: csv.cells.contact });
        if (v && site) {
          const k = `${site.id}:${lower(v.name)}`;
          if (existing.has(k)) c.fail('name', `Line '${v.name}' already exists on ${site.name}`);
          else if (firstRow.has(k)) c.fail('name', `Line '${v.name}' on ${site.name} appears twice in the file (first on row ${firstRow.get(k)})`);
          else firstRow.set(k, csv.row);
        }
        finish(c, v && site && { organisation_id: org, site_id: site.id, name: v.name, area: v.area, contact: v.contact });
      }
      return out;
    }

    if (kind === 'fields') {
      const existing = await repo.fields(trx, org);
      const names = new Set(existing.map((f) => lower(f.name)));
      const firstRow = new Map<string, number>();
      let position = existing.reduce((m, f) => Math.max(m, f.position + 1), 0);
      for (const csv of parsed.rows) {
        const c = new RowCheck(csv, headerOf);
        const type = c.cell('type', choiceCell(csv.cells.type ?? '', FIELD_TYPES, FIELD_TYPE_LABELS, { yesno: 'yes-no', boolean: 'yes-no' }));
        const v = type === undefined ? undefined : c.zod(FieldInput, { name: csv.cells.name ?? '', type: type ?? '', unit: csv.cells.unit });
        if (v) {
          const k = lower(v.name);
          const clash = standardFieldClash(v.name);
          if (clash) c.fail('name', clash);
          else if (names.has(k)) c.fail('name', `Field '${v.name}' already exists`);
          else if (firstRow.has(k)) c.fail('name', `Field '${v.name}' appears twice in the file (first on row ${firstRow.get(k)})`);
          else if (existing.length + firstRow.size >= ASSET_LIMITS.customFields) c.fail(null, `An organisation can have at most ${ASSET_LIMITS.customFields} fields of its own`);
          else firstRow.set(k, csv.row);
        }
        finish(c, v && { organisation_id: org, name: v.name, type: v.type, unit: v.unit, position: position++ });
      }
      return out;
    }

    if (kind === 'applicators') {
      const lines = await repo.lines(trx, org);
      const lineByKey = new Map(lines.map((l) => [`${l.siteId}:${lower(l.name)}`, l]));
      const fluids = fluidAliases(await repo.fluidFamilies(trx, org));
      const taken = new Map<string, number>();
      for (const row of await trx('applicators').where({ organisation_id: org }).select('site_id', 'tag')) taken.set(`${row.site_id}:${lower(row.tag)}`, 0);
      for (const csv of parsed.rows) {
        const c = new RowCheck(csv, headerOf);
        const cells = csv.cells;
        const site = siteOf(c);
        let lineId: number | undefined;
        if (site) {
          if (!cells.line) c.fail('line', 'Line is required');
          else {
            const l = lineByKey.get(`${site.id}:${lower(cells.line)}`);
            if (!l) c.fail('line', `No line '${cells.line}' on ${site.name}; import or add the line first`);
            lineId = l?.id;
          }
        }
        const n = (key: string, unit: string) => c.cell(key, numberCell(cells[key] ?? '', { decimalComma: dc, unit }));
        const i = (key: string) => c.cell(key, integerCell(cells[key] ?? '', { decimalComma: dc, unit: 'cycles' }));
        let fluidFamily: string | null | undefined = null;
        if (cells.fluidFamily) {
          fluidFamily = fluids.get(headerKey(cells.fluidFamily));
          if (!fluidFamily) c.fail('fluidFamily', `'${cells.fluidFamily}' is not one of your fluid families (${[...new Set(fluids.values())].join(', ')})`);
        }
        const custom: Record<string, CustomValue> = {};
        for (const f of fields) {
          const v = c.cell(`custom:${f.id}`, customCell(f, cells[`custom:${f.id}`] ?? '', dc));
          if (v !== undefined && v !== null) custom[String(f.id)] = v;
        }
        const candidate = {
          lineId: lineId ?? 1,
          tag: cells.tag ?? '',
          actuation: c.cell('actuation', choiceCell(cells.actuation ?? '', ACTUATIONS, ACTUATION_LABELS, { air: 'air-operated', pneumatic: 'air-operated', solenoid: 'electric' })) ?? undefined,
          coilDrive: c.cell('coilDrive', choiceCell(cells.coilDrive ?? '', COIL_DRIVES, COIL_DRIVE_LABELS, { '24v': '24v-dc', '24vdc': '24v-dc', hv: 'high-voltage', highvoltage: 'high-voltage' })),
          airPressureBar: n('airPressureBar', 'bar'),
          needleTip: c.cell('needleTip', choiceCell(cells.needleTip ?? '', NEEDLE_TIPS, NEEDLE_TIP_LABELS, { conical: 'cone' })),
          needleMaterial: cells.needleMaterial,
          seatMaterial: cells.seatMaterial,
          orificeDiameterMm: n('orificeDiameterMm', 'mm'),
          nozzle: cells.nozzle,
          fluidFamily: fluidFamily ?? null,
          fluidName: cells.fluidName,
          viscosityMPas: n('viscosityMPas', 'mPa·s'),
          viscosityTemperatureC: n('viscosityTemperatureC', '°C'),
          densityGPerCm3: n('densityGPerCm3', 'g/cm³'),
          heated: c.cell('heated', booleanCell(cells.heated ?? '')),
          setTemperatureC: n('setTemperatureC', '°C'),
          installedOn: c.cell('installedOn', dateCell(cells.installedOn ?? '', 'Install date')),
          status: c.cell('status', choiceCell(cells.status ?? '', APPLICATOR_STATUSES, APPLICATOR_STATUS_LABELS, { outforrepair: 'out-for-repair', repair: 'out-for-repair' })) ?? undefined,
          cyclesPerMinute: n('cyclesPerMinute', 'cycles/min'),
          hoursPerDay: n('hoursPerDay', 'h/day'),
          daysPerWeek: n('daysPerWeek', 'days/week'),
          seatIntervalCycles: i('seatIntervalCycles'),
          needleIntervalCycles: i('needleIntervalCycles'),
          sealsIntervalCycles: i('sealsIntervalCycles'),
          custom,
        };
        const v = c.zod(ApplicatorInput, candidate);
        let insert: Record<string, unknown> | undefined;
        if (v && site && lineId) {
          const k = `${site.id}:${lower(v.tag)}`;
          const first = taken.get(k);
          if (first === 0) c.fail('tag', `Tag ${v.tag} already exists on ${site.name}`);
          else if (first !== undefined) c.fail('tag', `Tag ${v.tag} on ${site.name} appears twice in the file (first on row ${first})`);
          else taken.set(k, csv.row);
          const own = checkCustom(fields, v.custom);
          for (const [path, message] of Object.entries(own.errors)) c.fail(path.replace('custom.', 'custom:'), message);
          insert = { organisation_id: org, created_by: user.id, ...applicatorColumns(v, site.id, own.value) };
        }
        finish(c, insert);
      }
      return out;
    }

    // Counter readings: each applicator's readings, old and new, must stay in order.
    const applicators = await trx('applicators').where({ organisation_id: org }).select('id', 'site_id', 'tag');
    const byTag = new Map(applicators.map((a) => [`${a.site_id}:${lower(a.tag)}`, a.id as number]));
    const pending: { check: RowCheck; applicatorId: number; value: { readOn: string; count: number; counterReset: boolean; note: string | null } }[] = [];
    const checks: RowCheck[] = [];
    for (const csv of parsed.rows) {
      const c = new RowCheck(csv, headerOf);
      checks.push(c);
      const site = siteOf(c);
      let applicatorId: number | undefined;
      if (site) {
        if (!csv.cells.tag) c.fail('tag', 'Tag is required');
        else {
          applicatorId = byTag.get(`${site.id}:${lower(csv.cells.tag)}`);
          if (!applicatorId) c.fail('tag', `No applicator tagged ${csv.cells.tag} on ${site.name}`);
        }
      }
      const count = c.cell('count', integerCell(csv.cells.count ?? '', { decimalComma: dc, unit: 'cycles' }));
      const counterReset = c.cell('counterReset', booleanCell(csv.cells.counterReset ?? ''));
      const readOn = c.cell('readOn', csv.cells.readOn ? dateCell(csv.cells.readOn, 'Date') : { error: 'Date is required (YYYY-MM-DD)' });
      const v = c.zod(ReadingInput, { readOn: readOn ?? '', count: count ?? undefined, counterReset: counterReset ?? false, note: csv.cells.note });
      if (v && applicatorId && c.ok) pending.push({ check: c, applicatorId, value: v });
    }
    const existing = await repo.readingsOf(trx, [...new Set(pending.map((p) => p.applicatorId))]);
    const groups = new Map<number, typeof pending>();
    for (const p of pending) groups.set(p.applicatorId, [...(groups.get(p.applicatorId) ?? []), p]);
    for (const [applicatorId, group] of groups) {
      const sequence: ReadingPoint[] = (existing.get(applicatorId) ?? []).map((r) => ({ id: r.id, readOn: r.readOn, count: r.count, counterReset: r.counterReset }));
      // Rows are placed after the stored readings of their day, in file order.
      const ordered = [...group].sort((a, b) => byDate({ readOn: a.value.readOn, id: a.check.csv.row }, { readOn: b.value.readOn, id: b.check.csv.row }));
      for (const p of ordered) {
        const same = sequence.find((r) => r.readOn === p.value.readOn && r.count === p.value.count && r.counterReset === p.value.counterReset);
        const problem = same ? `This reading (${p.value.count} cycles on ${p.value.readOn}) is already recorded` : readingProblem(sequence, p.value);
        if (problem) {
          p.check.fail('count', problem);
          continue;
        }
        // Accepted rows count for the rows after them; refused ones must not.
        sequence.push({ id: 2 ** 40 + p.check.csv.row, readOn: p.value.readOn, count: p.value.count, counterReset: p.value.counterReset });
      }
    }
    const byCheck = new Map(pending.map((p) => [p.check, p]));
    for (const c of checks) {
      const p = byCheck.get(c);
      finish(
        c,
        p && {
          organisation_id: org,
          applicator_id: p.applicatorId,
          read_on: p.value.readOn,
          count: p.value.count,
          counter_reset: p.value.counterReset,
          source: 'csv',
          note: p.value.note,
          recorded_by: user.id,
        },
      );
    }
    return out;
  }

  const TABLES: Record<ImportKind, string> = { sites: 'sites', lines: 'lines', fields: 'applicator_fields', applicators: 'applicators', readings: 'counter_readings' };

  function problemsOf(checked: Checked[]) {
    const all = checked.flatMap((c) => c.problems);
    return { listed: all.slice(0, ASSET_LIMITS.importProblems), more: Math.max(0, all.length - ASSET_LIMITS.importProblems) };
  }

  return {
    async preview(user: SessionUser, kind: ImportKind, text: string): Promise<ImportPreview> {
      return db.transaction(
        async (trx) => {
          const { parsed, fields } = await parseFor(trx, user, kind, text);
          const checked = await check(trx, user, kind, parsed, fields);
          const { listed, more } = problemsOf(checked);
          const headerOrder = Object.entries(parsed.headers);
          const invalid = checked.filter((c) => !c.insert).length;
          return {
            kind,
            delimiter: parsed.delimiter,
            columns: headerOrder.map(([, h]) => h),
            totalRows: checked.length,
            validRows: checked.length - invalid,
            invalidRows: invalid,
            sample: checked.slice(0, 20).map((c) => ({ row: c.row, ok: Boolean(c.insert), values: Object.fromEntries(headerOrder.map(([k, h]) => [h, c.cells[k] ?? ''])) })),
            problems: listed,
            moreProblems: more,
          };
        },
        { isolationLevel: 'repeatable read', readOnly: true },
      );
    },

    async commit(user: SessionUser, kind: ImportKind, text: string, mode: ImportMode): Promise<ImportResult> {
      return db.transaction(async (trx) => {
        // Checks and writes see the same rows: no other import or edit slips in between.
        await repo.lockOrganisation(trx, user.organisationId);
        const { parsed, fields } = await parseFor(trx, user, kind, text);
        const checked = await check(trx, user, kind, parsed, fields);
        const bad = checked.filter((c) => !c.insert);
        const { listed, more } = problemsOf(checked);
        if (!checked.length) throw AppError.invalid('The file has a header but no rows to import', { file: 'No rows under the header' });
        if (bad.length && mode === 'all-or-nothing') {
          const fieldMap: Record<string, string> = {};
          for (const p of listed.slice(0, 100)) fieldMap[`rows.${p.row ?? 0}.${p.column ?? 'row'}`] ??= `Row ${p.row}${p.column ? `, ${p.column}` : ''}: ${p.message}`;
          const first = listed[0];
          throw new AppError(
            'invalid_input',
            `Nothing was imported: ${bad.length} of ${checked.length} row${checked.length > 1 ? 's have' : ' has'} problems (first: row ${first.row}${first.column ? `, ${first.column}` : ''}: ${first.message}). Fix them, or import the valid rows only.`,
            fieldMap,
            { problems: listed, moreProblems: more, invalidRows: bad.length, totalRows: checked.length },
          );
        }
        const good = checked.filter((c) => c.insert).map((c) => c.insert!);
        if (!good.length) throw AppError.invalid('No row of the file is valid, so nothing was imported', { file: 'No valid rows' });
        for (let i = 0; i < good.length; i += 1000) await trx(TABLES[kind]).insert(good.slice(i, i + 1000));
        await audit(trx, { organisationId: user.organisationId, userId: user.id, action: 'assets.import', entityKind: kind, after: { imported: good.length, skippedRows: bad.length, mode } });
        return { kind, imported: good.length, skipped: listed, skippedRows: bad.length };
      });
    },

    template(kind: ImportKind, fields: FieldView[] = []): string {
      return toCsv([...CSV_COLUMNS[kind].map((c) => c.header), ...(kind === 'applicators' ? fields.map(customFieldHeader) : [])], []);
    },

    async export(user: SessionUser, kind: ImportKind | 'service-events'): Promise<string> {
      const org = user.organisationId;
      const headers = (k: ImportKind) => CSV_COLUMNS[k].map((c) => c.header);
      if (kind === 'sites') {
        const rows = await repo.sites(db, org);
        return toCsv(
          headers('sites'),
          rows.map((s) => [s.name, s.address, s.contact]),
        );
      }
      if (kind === 'lines') {
        const rows = await repo.lines(db, org);
        return toCsv(
          headers('lines'),
          rows.map((l) => [l.siteName, l.name, l.area, l.contact]),
        );
      }
      if (kind === 'fields') {
        const rows = await repo.fields(db, org);
        return toCsv(
          headers('fields'),
          rows.map((f) => [f.name, f.type, f.unit]),
        );
      }
      if (kind === 'applicators') {
        const fields = await repo.fields(db, org);
        const { items } = await repo.applicators(db, org, { status: 'all' }, Number.MAX_SAFE_INTEGER);
        const keys = CSV_COLUMNS.applicators.map((c) => c.key);
        return toCsv(
          [...headers('applicators'), ...fields.map(customFieldHeader)],
          items.map((a) => {
            const by: Record<string, CsvValue> = { ...(a as unknown as Record<string, CsvValue>), site: a.siteName, line: a.lineName };
            return [...keys.map((k) => by[k]), ...fields.map((f) => (a.custom[String(f.id)] ?? null) as CsvValue)];
          }),
        );
      }
      if (kind === 'readings') {
        const rows = await db('counter_readings as r')
          .join('applicators as a', 'a.id', 'r.applicator_id')
          .join('sites as s', 's.id', 'a.site_id')
          .where('r.organisation_id', org)
          .select('s.name as site', 'a.tag', db.raw("to_char(r.read_on, 'YYYY-MM-DD') as read_on"), 'r.count', 'r.counter_reset', 'r.note')
          .orderByRaw('lower(s.name), lower(a.tag), r.read_on, r.id');
        return toCsv(
          headers('readings'),
          rows.map((r) => [r.site, r.tag, r.read_on, Number(r.count), r.counter_reset, r.note]),
        );
      }
      const causes = await repo.causes(db, org);
      const rows = await db('service_events as e')
        .join('applicators as a', 'a.id', 'e.applicator_id')
        .join('sites as s', 's.id', 'a.site_id')
        .join('lines as l', 'l.id', 'a.line_id')
        .where('e.organisation_id', org)
        .select('e.*', 's.name as site', 'l.name as line', 'a.tag', db.raw("to_char(e.performed_on, 'YYYY-MM-DD') as performed_on"))
        .orderByRaw('e.performed_on desc, e.id desc');
      return toCsv(
        ['Site', 'Line', 'Tag', 'Date', 'Work done', 'Other work', 'Cause code', 'Cause', 'Parts', 'Cycle count', 'Done by', 'Notes', 'Walk', 'Photos'],
        rows.map((e) => [
          e.site,
          e.line,
          e.tag,
          e.performed_on,
          (e.actions as (keyof typeof SERVICE_ACTION_LABELS)[]).map((x) => SERVICE_ACTION_LABELS[x]).join('; '),
          e.other_action,
          e.cause_code,
          e.cause_code ? (causes.find((c) => c.code === e.cause_code)?.label ?? e.cause_code) : null,
          (e.parts as { name: string; partNumber: string | null; quantity: number }[]).map((p) => `${p.quantity} × ${p.name}${p.partNumber ? ` (${p.partNumber})` : ''}`).join('; '),
          e.cycle_count === null ? null : Number(e.cycle_count),
          e.performed_by,
          e.notes,
          e.walk_id,
          (e.file_ids as string[]).length,
        ]),
      );
    },
  };
}
export type AssetsImport = ReturnType<typeof createAssetsImport>;
