// Sites, lines, the organisation's own fields, applicators, counter readings and service events:
// every rule that needs the database (names and tags unique, the counter never going backwards,
// causes, walks and photos belonging to the organisation) and the applicator page with its
// counter model and forecasts.
import type { Knex } from 'knex';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import {
  localToday,
  type ApplicatorDetail,
  type ApplicatorInput,
  type ApplicatorListQuery,
  type CustomValue,
  type FieldInput,
  type FieldView,
  type LineInput,
  type ReadingInput,
  type ServiceEventInput,
  type ServiceEventView,
  type SiteInput,
  CSV_COLUMNS,
  dateProblem,
} from '../../../src/shared/schemas/assets';
import { AppError } from '../../lib/app-error';
import type { FilesService } from '../files/files.service';
import { headerKey } from './assets.csv';
import { counterModel, defaultIntervalsFrom, forecasts, readingProblem, removalProblem } from './assets.counters';
import { readOrgSettings } from '../admin/settings.routes';
import { assetsRepository as repo, type ApplicatorColumns, type ServiceEventRecord } from './assets.repository';

function isUniqueViolation(err: unknown): boolean {
  return (err as { code?: string })?.code === '23505';
}

/** Checks values of the organisation's own fields; errors are keyed `custom.<field id>`. */
export function checkCustom(fields: FieldView[], custom: Record<string, CustomValue>): { value: Record<string, CustomValue>; errors: Record<string, string> } {
  const byId = new Map(fields.map((f) => [String(f.id), f]));
  const value: Record<string, CustomValue> = {};
  const errors: Record<string, string> = {};
  for (const [key, v] of Object.entries(custom)) {
    const f = byId.get(key);
    const path = `custom.${key}`;
    if (!f) {
      errors[path] = 'There is no such field in your organisation; reload the page';
      continue;
    }
    if (v === null || v === '') continue;
    if (f.type === 'number' && (typeof v !== 'number' || !Number.isFinite(v))) errors[path] = `${f.name} must be a number${f.unit ? ` in ${f.unit}` : ''}`;
    else if (f.type === 'yes-no' && typeof v !== 'boolean') errors[path] = `${f.name} must be yes or no`;
    else if (f.type === 'text' && typeof v !== 'string') errors[path] = `${f.name} must be text`;
    else if (f.type === 'date') {
      const problem = typeof v === 'string' ? dateProblem(v, f.name) : `${f.name} must be a date (YYYY-MM-DD)`;
      if (problem) errors[path] = problem;
    }
    if (!errors[path]) value[key] = typeof v === 'string' ? v.trim() : v;
  }
  return { value, errors };
}

/** An own field named like a standard column would make the CSV header ambiguous. */
export function standardFieldClash(name: string): string | null {
  const k = headerKey(name);
  const clash = CSV_COLUMNS.applicators.find((c) => headerKey(c.header) === k || headerKey(c.key) === k);
  return clash ? `'${clash.header}' is already a standard applicator field` : null;
}

export function applicatorColumns(input: ApplicatorInput, siteId: number, custom: Record<string, CustomValue>): ApplicatorColumns {
  return {
    site_id: siteId,
    line_id: input.lineId,
    tag: input.tag,
    actuation: input.actuation,
    coil_drive: input.coilDrive,
    air_pressure_bar: input.airPressureBar,
    needle_tip: input.needleTip,
    needle_material: input.needleMaterial,
    seat_material: input.seatMaterial,
    orifice_diameter_mm: input.orificeDiameterMm,
    nozzle: input.nozzle,
    fluid_family: input.fluidFamily,
    fluid_name: input.fluidName,
    viscosity_mpa_s: input.viscosityMPas,
    viscosity_temperature_c: input.viscosityTemperatureC,
    density_g_cm3: input.densityGPerCm3,
    heated: input.heated,
    set_temperature_c: input.setTemperatureC,
    installed_on: input.installedOn,
    status: input.status,
    cycles_per_minute: input.cyclesPerMinute,
    hours_per_day: input.hoursPerDay,
    days_per_week: input.daysPerWeek,
    seat_interval_cycles: input.seatIntervalCycles,
    needle_interval_cycles: input.needleIntervalCycles,
    seals_interval_cycles: input.sealsIntervalCycles,
    custom: JSON.stringify(custom),
  };
}

export function createAssetsService(deps: { db: Knex; files: FilesService }) {
  const { db } = deps;

  async function mustApplicator(trx: Knex, user: SessionUser, id: number, lock = false) {
    const a = await repo.applicator(trx, user.organisationId, id, { lock });
    if (!a) throw AppError.notFound('This applicator');
    return a;
  }

  async function mustSite(trx: Knex, user: SessionUser, id: number, field?: string) {
    const s = await repo.site(trx, user.organisationId, id);
    if (!s) {
      if (field) throw new AppError('invalid_input', 'This site was not found in your organisation', { [field]: 'No such site in your organisation' });
      throw AppError.notFound('This site');
    }
    return s;
  }

  async function mustLine(trx: Knex, user: SessionUser, id: number, field?: string) {
    const l = await repo.line(trx, user.organisationId, id);
    if (!l) {
      if (field) throw new AppError('invalid_input', 'This line was not found in your organisation', { [field]: 'No such line in your organisation' });
      throw AppError.notFound('This line');
    }
    return l;
  }

  /** DB-side checks of an applicator: its line, unique tag on the site, fluid family, own fields. */
  async function prepareApplicator(trx: Knex, user: SessionUser, input: ApplicatorInput, exceptId?: number, current?: { fluidFamily: string | null }) {
    const line = await mustLine(trx, user, input.lineId, 'lineId');
    const errors: Record<string, string> = {};
    if (input.fluidFamily) {
      const families = await repo.fluidFamilies(trx, user.organisationId);
      const ok = families.some((f) => f.slug === input.fluidFamily && (f.active || f.slug === current?.fluidFamily));
      if (!ok)
        errors.fluidFamily = `Unknown fluid family '${input.fluidFamily}'; use one of ${families
          .filter((f) => f.active)
          .map((f) => f.slug)
          .join(', ')}`;
    }
    const custom = checkCustom(await repo.fields(trx, user.organisationId), input.custom);
    Object.assign(errors, custom.errors);
    if (Object.keys(errors).length) {
      const [first] = Object.values(errors);
      throw AppError.invalid(`Some fields are not valid: ${first}`, errors);
    }
    if (await repo.tagTaken(trx, line.siteId, input.tag, exceptId)) {
      throw AppError.conflict(`Tag ${input.tag} is already used on ${line.siteName}`, { tag: `Already used on ${line.siteName}; tags are unique on a site` });
    }
    return applicatorColumns(input, line.siteId, custom.value);
  }

  async function causeLabels(trx: Knex, organisationId: number) {
    const list = await repo.causes(trx, organisationId);
    return { list, label: (code: string | null) => (code ? (list.find((c) => c.code === code)?.label ?? code) : null) };
  }

  async function eventViews(trx: Knex, user: SessionUser, events: ServiceEventRecord[]): Promise<ServiceEventView[]> {
    const { label } = await causeLabels(trx, user.organisationId);
    const files = await deps.files.describe(user.organisationId, [...new Set(events.flatMap((e) => e.fileIds))]);
    const byId = new Map(files.map((f) => [f.id.toLowerCase(), { id: f.id, kind: f.kind, urls: f.urls, originalName: f.originalName }]));
    return events.map((e) => {
      const { fileIds, applicatorId: _a, ...rest } = e;
      return { ...rest, causeLabel: label(e.causeCode), files: fileIds.map((f) => byId.get(f.toLowerCase())).filter((f) => f !== undefined) };
    });
  }

  async function detail(trx: Knex, user: SessionUser, id: number): Promise<ApplicatorDetail> {
    const a = await mustApplicator(trx, user, id);
    const [fields, readings, events, walks, causes] = [
      await repo.fields(trx, user.organisationId),
      await repo.readings(trx, a.id),
      await repo.serviceEvents(trx, a.id),
      await repo.walksOn(trx, user.organisationId, a.id),
      await causeLabels(trx, user.organisationId),
    ];
    const today = localToday();
    const expected = { cyclesPerMinute: a.cyclesPerMinute, hoursPerDay: a.hoursPerDay, daysPerWeek: a.daysPerWeek };
    const model = counterModel(readings, { installedOn: a.installedOn, expected, today });
    const lifetime = new Map(model.points.map((p) => [p.id, p.lifetime]));
    return {
      ...a,
      fields,
      readings: readings.map((r) => ({
        id: r.id,
        readOn: r.readOn,
        count: r.count,
        counterReset: r.counterReset,
        source: r.source,
        note: r.note,
        lifetime: lifetime.get(r.id) ?? r.count,
        recordedByName: r.recordedByName,
      })),
      counter: model.summary,
      serviceEvents: await eventViews(trx, user, events),
      walks: walks.map((w) => ({ ...w, causeLabel: causes.label(w.causeCode) })),
      forecasts: forecasts({
        model,
        events,
        actuation: a.actuation,
        intervals: { seat: a.seatIntervalCycles, needle: a.needleIntervalCycles, seals: a.sealsIntervalCycles },
        expected,
        today,
        defaults: defaultIntervalsFrom(await readOrgSettings(trx, user.organisationId)),
      }),
    };
  }

  /** Adds one reading after checking it keeps the counter in order; the field named in errors is `field`. */
  async function addReading(
    trx: Knex,
    user: SessionUser,
    applicatorId: number,
    r: { readOn: string; count: number; counterReset: boolean; note: string | null; source: 'manual' | 'service' },
    field: string,
  ) {
    const existing = await repo.readings(trx, applicatorId);
    const problem = readingProblem(existing, r);
    if (problem) throw AppError.invalid(problem, { [field]: problem });
    return repo.insertReading(trx, { organisationId: user.organisationId, applicatorId, ...r, userId: user.id });
  }

  return {
    // ---- Sites ----
    listSites: (user: SessionUser) => repo.sites(db, user.organisationId),

    async createSite(user: SessionUser, input: SiteInput) {
      return db.transaction(async (trx) => {
        await repo.lockOrganisation(trx, user.organisationId);
        if (await repo.siteNameTaken(trx, user.organisationId, input.name)) throw AppError.conflict(`There is already a site called ${input.name}`, { name: 'A site with this name exists' });
        const [row] = await trx('sites')
          .insert({ organisation_id: user.organisationId, ...input })
          .returning('id');
        return (await repo.site(trx, user.organisationId, row.id))!;
      });
    },

    async updateSite(user: SessionUser, id: number, input: SiteInput) {
      return db.transaction(async (trx) => {
        await repo.lockOrganisation(trx, user.organisationId);
        await mustSite(trx, user, id);
        if (await repo.siteNameTaken(trx, user.organisationId, input.name, id)) throw AppError.conflict(`There is already a site called ${input.name}`, { name: 'A site with this name exists' });
        await trx('sites')
          .where({ id })
          .update({ ...input, updated_at: trx.fn.now() });
        return (await repo.site(trx, user.organisationId, id))!;
      });
    },

    async removeSite(user: SessionUser, id: number) {
      await db.transaction(async (trx) => {
        const s = await mustSite(trx, user, id);
        if (s.lineCount) throw AppError.conflict(`${s.name} still has ${s.lineCount} line${s.lineCount > 1 ? 's' : ''}; move or remove them first`);
        await trx('sites').where({ id }).delete();
      });
    },

    // ---- Lines ----
    listLines: (user: SessionUser, siteId?: number) => repo.lines(db, user.organisationId, siteId),

    async createLine(user: SessionUser, input: LineInput) {
      return db.transaction(async (trx) => {
        await repo.lockOrganisation(trx, user.organisationId);
        const site = await mustSite(trx, user, input.siteId, 'siteId');
        if (await repo.lineNameTaken(trx, site.id, input.name)) throw AppError.conflict(`${site.name} already has a line called ${input.name}`, { name: 'A line with this name exists on the site' });
        const [row] = await trx('lines').insert({ organisation_id: user.organisationId, site_id: site.id, name: input.name, area: input.area, contact: input.contact }).returning('id');
        return (await repo.line(trx, user.organisationId, row.id))!;
      });
    },

    async updateLine(user: SessionUser, id: number, input: LineInput) {
      return db.transaction(async (trx) => {
        await repo.lockOrganisation(trx, user.organisationId);
        const line = await mustLine(trx, user, id);
        const site = await mustSite(trx, user, input.siteId, 'siteId');
        if (site.id !== line.siteId && line.applicatorCount) {
          throw AppError.conflict('This line has applicators; a line keeps its site so their tags stay unique', { siteId: 'A line with applicators cannot move to another site' });
        }
        if (await repo.lineNameTaken(trx, site.id, input.name, id))
          throw AppError.conflict(`${site.name} already has a line called ${input.name}`, { name: 'A line with this name exists on the site' });
        await trx('lines').where({ id }).update({ site_id: site.id, name: input.name, area: input.area, contact: input.contact, updated_at: trx.fn.now() });
        return (await repo.line(trx, user.organisationId, id))!;
      });
    },

    async removeLine(user: SessionUser, id: number) {
      await db.transaction(async (trx) => {
        const l = await mustLine(trx, user, id);
        if (l.applicatorCount) throw AppError.conflict(`${l.name} still has ${l.applicatorCount} applicator${l.applicatorCount > 1 ? 's' : ''}; move them to another line first`);
        await trx('lines').where({ id }).delete();
      });
    },

    // ---- The organisation's own fields ----
    listFields: (user: SessionUser) => repo.fields(db, user.organisationId),

    async createField(user: SessionUser, input: FieldInput) {
      return db.transaction(async (trx) => {
        await repo.lockOrganisation(trx, user.organisationId);
        const fields = await repo.fields(trx, user.organisationId);
        if (fields.length >= 50) throw AppError.conflict('An organisation can have at most 50 fields of its own');
        const clash = standardFieldClash(input.name);
        if (clash) throw AppError.invalid(clash, { name: clash });
        if (await repo.fieldNameTaken(trx, user.organisationId, input.name)) throw AppError.conflict(`There is already a field called ${input.name}`, { name: 'A field with this name exists' });
        const position = fields.reduce((m, f) => Math.max(m, f.position + 1), 0);
        const [row] = await trx('applicator_fields').insert({ organisation_id: user.organisationId, name: input.name, type: input.type, unit: input.unit, position }).returning('id');
        return (await repo.fields(trx, user.organisationId)).find((f) => f.id === row.id)!;
      });
    },

    async updateField(user: SessionUser, id: number, input: FieldInput) {
      return db.transaction(async (trx) => {
        await repo.lockOrganisation(trx, user.organisationId);
        const field = (await repo.fields(trx, user.organisationId)).find((f) => f.id === id);
        if (!field) throw AppError.notFound('This field');
        const clash = standardFieldClash(input.name);
        if (clash) throw AppError.invalid(clash, { name: clash });
        // Values already stored were checked against the old type; changing it would strand them.
        if (field.type !== input.type) {
          const used = await trx('applicators')
            .where({ organisation_id: user.organisationId })
            .whereRaw('jsonb_exists(custom, ?)', [String(id)])
            .first('id');
          if (used) throw AppError.conflict(`Applicators already have values in ${field.name}; its type cannot change`, { type: 'Values are stored with the current type' });
        }
        if (await repo.fieldNameTaken(trx, user.organisationId, input.name, id)) throw AppError.conflict(`There is already a field called ${input.name}`, { name: 'A field with this name exists' });
        await trx('applicator_fields').where({ id }).update({ name: input.name, type: input.type, unit: input.unit });
        return (await repo.fields(trx, user.organisationId)).find((f) => f.id === id)!;
      });
    },

    async removeField(user: SessionUser, id: number) {
      await db.transaction(async (trx) => {
        const n = await trx('applicator_fields').where({ id, organisation_id: user.organisationId }).delete();
        if (!n) throw AppError.notFound('This field');
        await trx('applicators')
          .where({ organisation_id: user.organisationId })
          .update({ custom: trx.raw('custom - ?', [String(id)]) });
      });
    },

    // ---- Applicators ----
    listApplicators: (user: SessionUser, query: ApplicatorListQuery) => repo.applicators(db, user.organisationId, query),

    async get(user: SessionUser, id: number) {
      return db.transaction((trx) => detail(trx, user, id), { isolationLevel: 'repeatable read', readOnly: true });
    },

    async createApplicator(user: SessionUser, input: ApplicatorInput) {
      try {
        return await db.transaction(async (trx) => {
          await repo.lockOrganisation(trx, user.organisationId);
          const cols = await prepareApplicator(trx, user, input);
          const [row] = await trx('applicators')
            .insert({ organisation_id: user.organisationId, created_by: user.id, ...cols })
            .returning('id');
          return detail(trx, user, row.id);
        });
      } catch (err) {
        if (isUniqueViolation(err)) throw AppError.conflict(`Tag ${input.tag} is already used on this site`, { tag: 'Already used on this site' });
        throw err;
      }
    },

    async updateApplicator(user: SessionUser, id: number, input: ApplicatorInput) {
      try {
        return await db.transaction(async (trx) => {
          await repo.lockOrganisation(trx, user.organisationId);
          const current = await mustApplicator(trx, user, id, true);
          const cols = await prepareApplicator(trx, user, input, id, current);
          await trx('applicators')
            .where({ id })
            .update({ ...cols, updated_at: trx.fn.now() });
          // Walks keep the words they were started with, except when they were filled from this record.
          return detail(trx, user, id);
        });
      } catch (err) {
        if (isUniqueViolation(err)) throw AppError.conflict(`Tag ${input.tag} is already used on this site`, { tag: 'Already used on this site' });
        throw err;
      }
    },

    // ---- Counter readings ----
    async addReading(user: SessionUser, id: number, input: ReadingInput) {
      return db.transaction(async (trx) => {
        // Locking the applicator serialises readings on it, so two phones cannot interleave a rule break.
        await mustApplicator(trx, user, id, true);
        await addReading(trx, user, id, { ...input, source: 'manual' }, 'count');
        return detail(trx, user, id);
      });
    },

    async removeReading(user: SessionUser, id: number, readingId: number) {
      return db.transaction(async (trx) => {
        await mustApplicator(trx, user, id, true);
        const existing = await repo.readings(trx, id);
        if (!existing.some((r) => r.id === readingId)) throw AppError.notFound('This reading');
        const problem = removalProblem(existing, readingId);
        if (problem) throw AppError.conflict(problem);
        await trx('service_events').where({ reading_id: readingId }).update({ reading_id: null });
        await trx('counter_readings').where({ id: readingId }).delete();
        return detail(trx, user, id);
      });
    },

    // ---- Service events ----
    async addServiceEvent(user: SessionUser, id: number, input: ServiceEventInput) {
      try {
        return await db.transaction(async (trx) => {
          const a = await mustApplicator(trx, user, id, true);
          const errors: Record<string, string> = {};
          if (input.causeCode) {
            const { list } = await causeLabels(trx, user.organisationId);
            if (!list.some((c) => c.code === input.causeCode && c.active)) errors.causeCode = `Unknown cause '${input.causeCode}'; choose one from your organisation's list`;
          }
          if (input.walkId !== null) {
            const walk = await repo.walk(trx, user.organisationId, input.walkId);
            if (!walk) errors.walkId = 'No such walk in your organisation';
            else if (walk.applicatorId !== null && walk.applicatorId !== a.id) errors.walkId = 'This walk was on another applicator';
          }
          if (input.fileIds.length) {
            const found = await repo.existingFileIds(trx, user.organisationId, input.fileIds);
            const missing = input.fileIds.filter((f) => !found.has(f));
            if (missing.length) errors.fileIds = `${missing.length === 1 ? 'A photo was' : `${missing.length} photos were`} not found; upload again`;
          }
          if (Object.keys(errors).length) throw AppError.invalid(`Some fields are not valid: ${Object.values(errors)[0]}`, errors);
          if (input.walkId !== null && (await trx('service_events').where({ walk_id: input.walkId }).first('id'))) {
            throw AppError.conflict('A service event was already recorded for this walk', { walkId: 'Already recorded for this walk' });
          }
          const readingId =
            input.cycleCount !== null
              ? await addReading(trx, user, a.id, { readOn: input.performedOn, count: input.cycleCount, counterReset: input.counterReset, note: 'Read at a service', source: 'service' }, 'cycleCount')
              : null;
          await trx('service_events').insert({
            organisation_id: user.organisationId,
            applicator_id: a.id,
            performed_on: input.performedOn,
            actions: input.actions,
            other_action: input.actions.includes('other') ? input.otherAction : null,
            cause_code: input.causeCode,
            parts: JSON.stringify(input.parts),
            cycle_count: input.cycleCount,
            reading_id: readingId,
            performed_by: input.performedBy ?? user.name,
            notes: input.notes,
            file_ids: input.fileIds,
            walk_id: input.walkId,
            recorded_by: user.id,
          });
          return detail(trx, user, a.id);
        });
      } catch (err) {
        if (isUniqueViolation(err)) throw AppError.conflict('A service event was already recorded for this walk', { walkId: 'Already recorded for this walk' });
        throw err;
      }
    },

    async removeServiceEvent(user: SessionUser, id: number, eventId: number) {
      return db.transaction(async (trx) => {
        await mustApplicator(trx, user, id, true);
        const e = await repo.serviceEvent(trx, id, eventId);
        if (!e) throw AppError.notFound('This service event');
        await trx('service_events').where({ id: eventId }).delete();
        // The reading taken with the service goes with it, unless removing it would break the order.
        if (e.readingId !== null) {
          const existing = await repo.readings(trx, id);
          if (!removalProblem(existing, e.readingId)) await trx('counter_readings').where({ id: e.readingId }).delete();
        }
        return detail(trx, user, id);
      });
    },
  };
}
export type AssetsService = ReturnType<typeof createAssetsService>;
