// Sites, lines, fields, applicators, counter readings and service events as plain typed objects.
// Dates leave PostgreSQL as YYYY-MM-DD text and bigints as numbers, so no time zone or string
// arithmetic creeps in. Walks, causes and tags are read from their tables directly so the
// assets module does not depend on the modules that own them.
import type { Knex } from 'knex';
import type {
  ApplicatorListItem,
  ApplicatorListQuery,
  ApplicatorView,
  ApplicatorWalkView,
  CustomValue,
  FieldView,
  LineView,
  PartUsed,
  ReadingSource,
  ServiceAction,
  SiteView,
} from '../../../src/shared/schemas/assets';
import { ASSET_LIMITS } from '../../../src/shared/schemas/assets';
import { DEFAULT_CAUSES, DEFAULT_TAGS } from '../../../src/shared/tags';

const day = (column: string, as: string) => `to_char(${column}, 'YYYY-MM-DD') as ${as}`;
const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));

export interface ApplicatorRow {
  id: number;
  organisation_id: number;
  site_id: number;
  site_name: string;
  line_id: number;
  line_name: string;
  tag: string;
  actuation: ApplicatorView['actuation'];
  coil_drive: ApplicatorView['coilDrive'];
  air_pressure_bar: number | null;
  needle_tip: ApplicatorView['needleTip'];
  needle_material: string | null;
  seat_material: string | null;
  orifice_diameter_mm: number | null;
  nozzle: string | null;
  fluid_family: string | null;
  fluid_name: string | null;
  viscosity_mpa_s: number | null;
  viscosity_temperature_c: number | null;
  density_g_cm3: number | null;
  heated: boolean;
  set_temperature_c: number | null;
  installed_on: string | null;
  status: ApplicatorView['status'];
  cycles_per_minute: number | null;
  hours_per_day: number | null;
  days_per_week: number | null;
  seat_interval_cycles: string | number | null;
  needle_interval_cycles: string | number | null;
  seals_interval_cycles: string | number | null;
  custom: Record<string, CustomValue>;
  updated_at: Date;
}

export function toApplicator(r: ApplicatorRow): ApplicatorView {
  return {
    id: r.id,
    siteId: r.site_id,
    siteName: r.site_name,
    lineId: r.line_id,
    lineName: r.line_name,
    tag: r.tag,
    actuation: r.actuation,
    coilDrive: r.coil_drive,
    airPressureBar: r.air_pressure_bar,
    needleTip: r.needle_tip,
    needleMaterial: r.needle_material,
    seatMaterial: r.seat_material,
    orificeDiameterMm: r.orifice_diameter_mm,
    nozzle: r.nozzle,
    fluidFamily: r.fluid_family,
    fluidName: r.fluid_name,
    viscosityMPas: r.viscosity_mpa_s,
    viscosityTemperatureC: r.viscosity_temperature_c,
    densityGPerCm3: r.density_g_cm3,
    heated: r.heated,
    setTemperatureC: r.set_temperature_c,
    installedOn: r.installed_on,
    status: r.status,
    cyclesPerMinute: r.cycles_per_minute,
    hoursPerDay: r.hours_per_day,
    daysPerWeek: r.days_per_week,
    seatIntervalCycles: num(r.seat_interval_cycles),
    needleIntervalCycles: num(r.needle_interval_cycles),
    sealsIntervalCycles: num(r.seals_interval_cycles),
    custom: r.custom ?? {},
    updatedAt: r.updated_at.toISOString(),
  };
}

/** The API's applicator fields as columns. */
export interface ApplicatorColumns {
  site_id: number;
  line_id: number;
  tag: string;
  actuation: string;
  coil_drive: string | null;
  air_pressure_bar: number | null;
  needle_tip: string | null;
  needle_material: string | null;
  seat_material: string | null;
  orifice_diameter_mm: number | null;
  nozzle: string | null;
  fluid_family: string | null;
  fluid_name: string | null;
  viscosity_mpa_s: number | null;
  viscosity_temperature_c: number | null;
  density_g_cm3: number | null;
  heated: boolean;
  set_temperature_c: number | null;
  installed_on: string | null;
  status: string;
  cycles_per_minute: number | null;
  hours_per_day: number | null;
  days_per_week: number | null;
  seat_interval_cycles: number | null;
  needle_interval_cycles: number | null;
  seals_interval_cycles: number | null;
  custom: string;
}

export interface ReadingRecord {
  id: number;
  applicatorId: number;
  readOn: string;
  count: number;
  counterReset: boolean;
  source: ReadingSource;
  note: string | null;
  recordedByName: string | null;
}

export interface ServiceEventRecord {
  id: number;
  applicatorId: number;
  performedOn: string;
  actions: ServiceAction[];
  otherAction: string | null;
  causeCode: string | null;
  parts: PartUsed[];
  cycleCount: number | null;
  readingId: number | null;
  performedBy: string | null;
  notes: string | null;
  fileIds: string[];
  walkId: number | null;
  recordedByName: string | null;
  createdAt: string;
}

const APPLICATOR_COLUMNS = ['a.*', 's.name as site_name', 'l.name as line_name'];

function applicatorQuery(db: Knex, organisationId: number) {
  return db('applicators as a')
    .join('sites as s', 's.id', 'a.site_id')
    .join('lines as l', 'l.id', 'a.line_id')
    .where('a.organisation_id', organisationId)
    .select([...APPLICATOR_COLUMNS, db.raw(day('a.installed_on', 'installed_on'))]);
}

function toReading(r: {
  id: number;
  applicator_id: number;
  read_on: string;
  count: string | number;
  counter_reset: boolean;
  source: ReadingSource;
  note: string | null;
  user_name?: string | null;
}): ReadingRecord {
  return {
    id: r.id,
    applicatorId: r.applicator_id,
    readOn: r.read_on,
    count: Number(r.count),
    counterReset: r.counter_reset,
    source: r.source,
    note: r.note,
    recordedByName: r.user_name ?? null,
  };
}

function toServiceEvent(r: Record<string, unknown>): ServiceEventRecord {
  return {
    id: r.id as number,
    applicatorId: r.applicator_id as number,
    performedOn: r.performed_on as string,
    actions: r.actions as ServiceAction[],
    otherAction: (r.other_action as string | null) ?? null,
    causeCode: (r.cause_code as string | null) ?? null,
    parts: (r.parts as PartUsed[]) ?? [],
    cycleCount: num(r.cycle_count),
    readingId: (r.reading_id as number | null) ?? null,
    performedBy: (r.performed_by as string | null) ?? null,
    notes: (r.notes as string | null) ?? null,
    fileIds: (r.file_ids as string[]) ?? [],
    walkId: (r.walk_id as number | null) ?? null,
    recordedByName: (r.user_name as string | null) ?? null,
    createdAt: (r.created_at as Date).toISOString(),
  };
}

export const assetsRepository = {
  /** Serialises writes that check uniqueness or counter order across rows of one organisation. */
  async lockOrganisation(db: Knex, organisationId: number): Promise<void> {
    await db.raw('select pg_advisory_xact_lock(?, ?)', [0x4153_5354, organisationId]);
  },

  // ---- Sites ----
  async sites(db: Knex, organisationId: number): Promise<SiteView[]> {
    const rows = await db('sites as s')
      .where('s.organisation_id', organisationId)
      .select('s.*', db.raw('(select count(*)::int from lines l where l.site_id = s.id) as line_count'), db.raw('(select count(*)::int from applicators a where a.site_id = s.id) as applicator_count'))
      .orderByRaw('lower(s.name)');
    return rows.map((r) => ({ id: r.id, name: r.name, address: r.address, contact: r.contact, lineCount: r.line_count, applicatorCount: r.applicator_count }));
  },
  async site(db: Knex, organisationId: number, id: number): Promise<SiteView | undefined> {
    return (await this.sites(db, organisationId)).find((s) => s.id === id);
  },
  async siteNameTaken(db: Knex, organisationId: number, name: string, exceptId?: number): Promise<boolean> {
    const q = db('sites').where({ organisation_id: organisationId }).whereRaw('lower(name) = lower(?)', [name]);
    if (exceptId) q.whereNot({ id: exceptId });
    return Boolean(await q.first('id'));
  },

  // ---- Lines ----
  async lines(db: Knex, organisationId: number, siteId?: number): Promise<LineView[]> {
    const q = db('lines as l')
      .join('sites as s', 's.id', 'l.site_id')
      .where('l.organisation_id', organisationId)
      .select('l.*', 's.name as site_name', db.raw('(select count(*)::int from applicators a where a.line_id = l.id) as applicator_count'))
      .orderByRaw('lower(s.name), lower(l.name)');
    if (siteId) q.where('l.site_id', siteId);
    const rows = await q;
    return rows.map((r) => ({ id: r.id, siteId: r.site_id, siteName: r.site_name, name: r.name, area: r.area, contact: r.contact, applicatorCount: r.applicator_count }));
  },
  async line(db: Knex, organisationId: number, id: number): Promise<LineView | undefined> {
    const rows = await db('lines as l')
      .join('sites as s', 's.id', 'l.site_id')
      .where({ 'l.organisation_id': organisationId, 'l.id': id })
      .select('l.*', 's.name as site_name', db.raw('(select count(*)::int from applicators a where a.line_id = l.id) as applicator_count'));
    const r = rows[0];
    return r ? { id: r.id, siteId: r.site_id, siteName: r.site_name, name: r.name, area: r.area, contact: r.contact, applicatorCount: r.applicator_count } : undefined;
  },
  async lineNameTaken(db: Knex, siteId: number, name: string, exceptId?: number): Promise<boolean> {
    const q = db('lines').where({ site_id: siteId }).whereRaw('lower(name) = lower(?)', [name]);
    if (exceptId) q.whereNot({ id: exceptId });
    return Boolean(await q.first('id'));
  },

  // ---- Fields ----
  async fields(db: Knex, organisationId: number): Promise<FieldView[]> {
    const rows = await db('applicator_fields').where({ organisation_id: organisationId }).orderBy(['position', 'id']);
    return rows.map((r) => ({ id: r.id, name: r.name, type: r.type, unit: r.unit, position: r.position }));
  },
  async fieldNameTaken(db: Knex, organisationId: number, name: string, exceptId?: number): Promise<boolean> {
    const q = db('applicator_fields').where({ organisation_id: organisationId }).whereRaw('lower(name) = lower(?)', [name]);
    if (exceptId) q.whereNot({ id: exceptId });
    return Boolean(await q.first('id'));
  },

  // ---- Applicators ----
  async applicators(db: Knex, organisationId: number, query: Partial<ApplicatorListQuery>, limit: number = ASSET_LIMITS.listLimit): Promise<{ items: ApplicatorListItem[]; total: number }> {
    const q = applicatorQuery(db, organisationId);
    if (query.siteId) q.where('a.site_id', query.siteId);
    if (query.lineId) q.where('a.line_id', query.lineId);
    if (query.status === 'in-use') q.whereNot('a.status', 'retired');
    else if (query.status && query.status !== 'all') q.where('a.status', query.status);
    if (query.ids) q.whereIn('a.id', query.ids);
    if (query.q) {
      const like = `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
      q.where((w) => w.whereILike('a.tag', like).orWhereILike('a.fluid_name', like).orWhereILike('l.name', like).orWhereILike('s.name', like));
    }
    const total = Number((await q.clone().clearSelect().clearOrder().count('* as n'))[0].n);
    q.select(
      db.raw(`(select to_char(r.read_on, 'YYYY-MM-DD') from counter_readings r where r.applicator_id = a.id order by r.read_on desc, r.id desc limit 1) as last_reading_on`),
      db.raw('(select r.count from counter_readings r where r.applicator_id = a.id order by r.read_on desc, r.id desc limit 1) as last_count'),
      db.raw(`(select to_char(max(e.performed_on), 'YYYY-MM-DD') from service_events e where e.applicator_id = a.id) as last_service_on`),
    )
      .orderByRaw('lower(s.name), lower(l.name), lower(a.tag)')
      .limit(limit);
    const rows = await q;
    return {
      total,
      items: rows.map((r) => ({ ...toApplicator(r), lastReadingOn: r.last_reading_on ?? null, lastCount: num(r.last_count), lastServiceOn: r.last_service_on ?? null })),
    };
  },
  async applicator(db: Knex, organisationId: number, id: number, opts: { lock?: boolean } = {}): Promise<ApplicatorView | undefined> {
    const q = applicatorQuery(db, organisationId).where('a.id', id).first();
    if (opts.lock) q.forUpdate('a');
    const row = await q;
    return row ? toApplicator(row) : undefined;
  },
  async tagTaken(db: Knex, siteId: number, tag: string, exceptId?: number): Promise<boolean> {
    const q = db('applicators').where({ site_id: siteId }).whereRaw('lower(tag) = lower(?)', [tag]);
    if (exceptId) q.whereNot({ id: exceptId });
    return Boolean(await q.first('id'));
  },

  // ---- Readings ----
  async readings(db: Knex, applicatorId: number): Promise<ReadingRecord[]> {
    const rows = await db('counter_readings as r')
      .leftJoin('users as u', 'u.id', 'r.recorded_by')
      .where('r.applicator_id', applicatorId)
      .select('r.id', 'r.applicator_id', db.raw(day('r.read_on', 'read_on')), 'r.count', 'r.counter_reset', 'r.source', 'r.note', 'u.name as user_name')
      .orderBy([{ column: 'r.read_on' }, { column: 'r.id' }]);
    return rows.map(toReading);
  },
  async readingsOf(db: Knex, applicatorIds: number[]): Promise<Map<number, ReadingRecord[]>> {
    const out = new Map<number, ReadingRecord[]>(applicatorIds.map((i) => [i, []]));
    for (let i = 0; i < applicatorIds.length; i += 5000) {
      const rows = await db('counter_readings as r')
        .whereIn('r.applicator_id', applicatorIds.slice(i, i + 5000))
        .select('r.id', 'r.applicator_id', db.raw(day('r.read_on', 'read_on')), 'r.count', 'r.counter_reset', 'r.source', 'r.note')
        .orderBy(['r.applicator_id', 'r.read_on', 'r.id']);
      for (const r of rows) out.get(r.applicator_id)?.push(toReading(r));
    }
    return out;
  },
  async insertReading(
    db: Knex,
    row: { organisationId: number; applicatorId: number; readOn: string; count: number; counterReset: boolean; source: ReadingSource; note: string | null; userId: number },
  ): Promise<number> {
    const [r] = await db('counter_readings')
      .insert({
        organisation_id: row.organisationId,
        applicator_id: row.applicatorId,
        read_on: row.readOn,
        count: row.count,
        counter_reset: row.counterReset,
        source: row.source,
        note: row.note,
        recorded_by: row.userId,
      })
      .returning('id');
    return r.id;
  },

  // ---- Service events ----
  async serviceEvents(db: Knex, applicatorId: number): Promise<ServiceEventRecord[]> {
    const rows = await db('service_events as e')
      .leftJoin('users as u', 'u.id', 'e.recorded_by')
      .where('e.applicator_id', applicatorId)
      .select('e.*', db.raw(day('e.performed_on', 'performed_on')), 'u.name as user_name')
      .orderBy([
        { column: 'e.performed_on', order: 'desc' },
        { column: 'e.id', order: 'desc' },
      ]);
    return rows.map(toServiceEvent);
  },
  async serviceEvent(db: Knex, applicatorId: number, id: number): Promise<ServiceEventRecord | undefined> {
    const r = await db('service_events as e')
      .leftJoin('users as u', 'u.id', 'e.recorded_by')
      .where({ 'e.applicator_id': applicatorId, 'e.id': id })
      .first('e.*', db.raw(day('e.performed_on', 'performed_on')), 'u.name as user_name');
    return r ? toServiceEvent(r) : undefined;
  },

  // ---- Walks, causes, tags, files (owned by other modules; read only) ----
  async walksOn(db: Knex, organisationId: number, applicatorId: number): Promise<Omit<ApplicatorWalkView, 'causeLabel'>[]> {
    const rows = await db('walks as w')
      .join('guide_versions as v', 'v.id', 'w.guide_version_id')
      .leftJoin('users as u', 'u.id', 'w.user_id')
      .where({ 'w.organisation_id': organisationId, 'w.applicator_id': applicatorId })
      .select('w.id', 'w.guide_id', 'w.status', 'w.outcome', 'w.cause_code', 'w.started_at', 'w.ended_at', 'v.title', 'v.symptom', 'u.name as user_name')
      .orderBy('w.started_at', 'desc')
      .limit(100);
    return rows.map((r) => ({
      id: r.id,
      guideId: r.guide_id,
      guideTitle: r.title,
      symptom: r.symptom,
      status: r.status,
      outcome: r.outcome,
      causeCode: r.cause_code,
      userName: r.user_name ?? null,
      startedAt: r.started_at.toISOString(),
      endedAt: r.ended_at?.toISOString() ?? null,
    }));
  },
  async walk(db: Knex, organisationId: number, walkId: number): Promise<{ id: number; applicatorId: number | null; status: string } | undefined> {
    const r = await db('walks').where({ id: walkId, organisation_id: organisationId }).first('id', 'applicator_id', 'status');
    return r ? { id: r.id, applicatorId: r.applicator_id, status: r.status } : undefined;
  },
  /** The organisation's causes (or the defaults until it edits its list). */
  async causes(db: Knex, organisationId: number): Promise<{ code: string; label: string; active: boolean }[]> {
    const rows = await db('causes').where({ organisation_id: organisationId }).orderBy(['position', 'code']).select('code', 'label', 'active');
    return rows.length ? rows : DEFAULT_CAUSES.map((c) => ({ code: c.code, label: c.label, active: true }));
  },
  /** The organisation's fluid families (or the defaults until it edits its tags). */
  async fluidFamilies(db: Knex, organisationId: number): Promise<{ slug: string; label: string; active: boolean }[]> {
    const any = await db('tags').where({ organisation_id: organisationId }).first('id');
    if (!any) return DEFAULT_TAGS.filter((t) => t.group === 'fluid').map((t) => ({ slug: t.slug, label: t.label, active: true }));
    return db('tags').where({ organisation_id: organisationId, group: 'fluid' }).orderBy(['position', 'label']).select('slug', 'label', 'active');
  },
  async existingFileIds(db: Knex, organisationId: number, ids: string[]): Promise<Set<string>> {
    if (!ids.length) return new Set();
    const rows = await db('files').where({ organisation_id: organisationId }).whereIn('id', ids).select('id');
    return new Set(rows.map((r) => String(r.id).toLowerCase()));
  },
};

/** Applicator spec fields (camelCase, as in the API) and the columns that hold them; used by the demo seeds. */
export const APPLICATOR_SPEC_COLUMNS: Readonly<Record<string, string>> = {
  actuation: 'actuation',
  coilDrive: 'coil_drive',
  airPressureBar: 'air_pressure_bar',
  needleTip: 'needle_tip',
  needleMaterial: 'needle_material',
  seatMaterial: 'seat_material',
  orificeDiameterMm: 'orifice_diameter_mm',
  nozzle: 'nozzle',
  fluidFamily: 'fluid_family',
  fluidName: 'fluid_name',
  viscosityMPas: 'viscosity_mpa_s',
  viscosityTemperatureC: 'viscosity_temperature_c',
  densityGPerCm3: 'density_g_cm3',
  heated: 'heated',
  setTemperatureC: 'set_temperature_c',
  installedOn: 'installed_on',
  status: 'status',
  cyclesPerMinute: 'cycles_per_minute',
  hoursPerDay: 'hours_per_day',
  daysPerWeek: 'days_per_week',
  seatIntervalCycles: 'seat_interval_cycles',
  needleIntervalCycles: 'needle_interval_cycles',
  sealsIntervalCycles: 'seals_interval_cycles',
};
