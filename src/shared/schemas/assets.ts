// Sites, lines, applicators, counter readings, service events and CSV imports: the inputs the
// server validates (and the forms reuse) and the shapes /api/sites, /api/lines and
// /api/applicators answer with.
import { z } from 'zod';

export const ACTUATIONS = ['electric', 'air-operated'] as const;
export type Actuation = (typeof ACTUATIONS)[number];
export const ACTUATION_LABELS: Record<Actuation, string> = { electric: 'Electric (solenoid)', 'air-operated': 'Air-operated' };

export const COIL_DRIVES = ['24v-dc', 'high-voltage', 'ac'] as const;
export type CoilDrive = (typeof COIL_DRIVES)[number];
export const COIL_DRIVE_LABELS: Record<CoilDrive, string> = { '24v-dc': '24 V DC', 'high-voltage': 'High-voltage driver', ac: 'AC' };

export const NEEDLE_TIPS = ['cone', 'ball'] as const;
export type NeedleTip = (typeof NEEDLE_TIPS)[number];
export const NEEDLE_TIP_LABELS: Record<NeedleTip, string> = { cone: 'Cone', ball: 'Ball' };

export const APPLICATOR_STATUSES = ['running', 'spare', 'out-for-repair', 'retired'] as const;
export type ApplicatorStatus = (typeof APPLICATOR_STATUSES)[number];
export const APPLICATOR_STATUS_LABELS: Record<ApplicatorStatus, string> = { running: 'Running', spare: 'Spare', 'out-for-repair': 'Out for repair', retired: 'Retired' };

export const SERVICE_ACTIONS = ['seat-replaced', 'needle-replaced', 'seals-replaced', 'coil-replaced', 'cleaned', 'nozzle-replaced', 'other'] as const;
export type ServiceAction = (typeof SERVICE_ACTIONS)[number];
export const SERVICE_ACTION_LABELS: Record<ServiceAction, string> = {
  'seat-replaced': 'Seat replaced',
  'needle-replaced': 'Needle replaced',
  'seals-replaced': 'Seals replaced',
  'coil-replaced': 'Coil replaced',
  cleaned: 'Cleaned',
  'nozzle-replaced': 'Nozzle replaced',
  other: 'Other',
};

export const FIELD_TYPES = ['text', 'number', 'date', 'yes-no'] as const;
export type FieldType = (typeof FIELD_TYPES)[number];
export const FIELD_TYPE_LABELS: Record<FieldType, string> = { text: 'Text', number: 'Number', date: 'Date', 'yes-no': 'Yes or no' };

export const WEAR_PARTS = ['seat', 'needle', 'seals'] as const;
export type WearPart = (typeof WEAR_PARTS)[number];
/** The service action that renews each wear part, so its cycle count starts again. */
export const WEAR_PART_ACTION: Record<WearPart, ServiceAction> = { seat: 'seat-replaced', needle: 'needle-replaced', seals: 'seals-replaced' };

export const READING_SOURCES = ['manual', 'csv', 'service'] as const;
export type ReadingSource = (typeof READING_SOURCES)[number];

export const ASSET_LIMITS = {
  name: 120,
  text: 200,
  tag: 40,
  note: 1000,
  notes: 4000,
  parts: 30,
  photos: 10,
  customFields: 50,
  /** Above any real valve's lifetime, and well inside JavaScript's exact integers. */
  maxCount: 1e13,
  maxInterval: 1e12,
  listLimit: 500,
  /** The most data rows one CSV import takes. */
  importRows: 100_000,
  /** Row problems sent back at most; the counts still cover every row. */
  importProblems: 500,
} as const;

// PostgreSQL integer ids stop here; a larger number can only be a typo or a probe.
const MAX_ID = 2_147_483_647;

const id = (label: string) =>
  z.coerce
    .number({ error: `${label} must be a number` })
    .int(`${label} must be a whole number`)
    .positive(`${label} must be positive`)
    .max(MAX_ID, `${label} is too large`);

const bodyId = (label: string) =>
  z
    .number({ error: `${label} is required` })
    .int(`${label} must be a whole number`)
    .positive(`${label} must be positive`)
    .max(MAX_ID, `${label} is too large`);

/** Required text, trimmed. */
const name = (label: string, max: number = ASSET_LIMITS.name) =>
  z
    .string({ error: `${label} is required` })
    .trim()
    .min(1, `${label} is required`)
    .max(max, `${label} must be at most ${max} characters`);

/** Optional text: blank becomes null. */
const optText = (label: string, max: number = ASSET_LIMITS.text) =>
  z
    .string({ error: `${label} must be text` })
    .trim()
    .max(max, `${label} must be at most ${max} characters`)
    .nullish()
    .transform((v) => (v ? v : null));

/** An optional number within a physical range; the unit is part of the field's name. */
const optNumber = (label: string, unit: string, min: number, max: number, opts: { minExclusive?: boolean } = {}) =>
  z
    .number({ error: `${label} must be a number in ${unit}` })
    .refine((v) => Number.isFinite(v), `${label} must be a number in ${unit}`)
    .refine((v) => (opts.minExclusive ? v > min : v >= min), `${label} must be ${opts.minExclusive ? 'more than' : 'at least'} ${min} ${unit}`)
    .refine((v) => v <= max, `${label} must be at most ${max} ${unit}`)
    .nullish()
    .transform((v) => (v === undefined ? null : v));

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;

function isRealDate(value: string): boolean {
  if (!ISO_DATE.test(value)) return false;
  const d = new Date(`${value}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === value;
}

/**
 * The last calendar date that has begun somewhere on Earth (UTC+14). A date after it is in the
 * future for everyone, whatever the technician's time zone; the server need not know it.
 */
export function latestAllowedDate(now = new Date()): string {
  return new Date(now.getTime() + 14 * 3600 * 1000).toISOString().slice(0, 10);
}

/** Today in the device's own time zone, for forms. */
export function localToday(now = new Date()): string {
  const local = new Date(now.getTime() - now.getTimezoneOffset() * 60_000);
  return local.toISOString().slice(0, 10);
}

export function dateProblem(value: string, label: string, now = new Date()): string | null {
  if (!isRealDate(value)) return `${label} must be a date written as YYYY-MM-DD, e.g. 2025-03-14`;
  if (value < '1970-01-01') return `${label} is before 1970; check the year`;
  if (value > latestAllowedDate(now)) return `${label} is in the future; give the date it happened`;
  return null;
}

/** A past or present calendar date, YYYY-MM-DD. */
export const PastDate = (label: string) =>
  z.string({ error: `${label} is required (YYYY-MM-DD)` }).superRefine((value, ctx) => {
    const problem = dateProblem(value, label);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  });

const count = (label: string) =>
  z
    .number({ error: `${label} must be a whole number of cycles` })
    .int(`${label} must be a whole number of cycles`)
    .min(0, `${label} cannot be negative`)
    .max(ASSET_LIMITS.maxCount, `${label} is larger than any valve reaches; check the digits`);

const interval = (label: string) =>
  z
    .number({ error: `${label} must be a whole number of cycles` })
    .int(`${label} must be a whole number of cycles`)
    .positive(`${label} must be more than 0 cycles`)
    .max(ASSET_LIMITS.maxInterval, `${label} is too large; check the digits`)
    .nullish()
    .transform((v) => (v === undefined ? null : v));

// ---- Params and queries ---------------------------------------------------------------------

export const AssetIdParam = z.object({ id: id('Id') });
export const ReadingParam = z.object({ id: id('Applicator id'), readingId: id('Reading id') });
export const ServiceEventParam = z.object({ id: id('Applicator id'), eventId: id('Service event id') });

export const IMPORT_KINDS = ['sites', 'lines', 'fields', 'applicators', 'readings'] as const;
export type ImportKind = (typeof IMPORT_KINDS)[number];
export const IMPORT_KIND_LABELS: Record<ImportKind, string> = {
  sites: 'Sites',
  lines: 'Lines',
  fields: 'Your own fields',
  applicators: 'Applicators',
  readings: 'Counter readings',
};
export const ImportKindParam = z.object({ kind: z.enum(IMPORT_KINDS, { error: `The import kind must be one of ${IMPORT_KINDS.join(', ')}` }) });

export const LineListQuery = z.object({ siteId: id('Site id').optional() });

export const ApplicatorListQuery = z.object({
  siteId: id('Site id').optional(),
  lineId: id('Line id').optional(),
  status: z.enum([...APPLICATOR_STATUSES, 'all', 'in-use'], { error: `Status must be one of ${[...APPLICATOR_STATUSES, 'all', 'in-use'].join(', ')}` }).default('all'),
  q: z.string({ error: 'Search must be text' }).trim().max(120, 'Search text is too long').optional(),
  ids: z
    .string({ error: 'Ids must be a comma-separated list' })
    .regex(/^\d{1,10}(,\d{1,10}){0,499}$/, 'Ids must be up to 500 numbers separated by commas')
    .transform((s) => s.split(',').map(Number))
    .optional(),
});
export type ApplicatorListQuery = z.output<typeof ApplicatorListQuery>;

// ---- Inputs ---------------------------------------------------------------------------------

export const SiteInput = z.object({
  name: name('Site name'),
  address: optText('Address or area', 400),
  contact: optText('Contact'),
});
export type SiteInput = z.output<typeof SiteInput>;

export const LineInput = z.object({
  siteId: bodyId('Site'),
  name: name('Line name'),
  area: optText('Area'),
  contact: optText('Contact'),
});
export type LineInput = z.output<typeof LineInput>;

export const FieldInput = z
  .object({
    name: name('Field name', 60),
    type: z.enum(FIELD_TYPES, { error: `Type must be one of ${FIELD_TYPES.join(', ')}` }),
    unit: optText('Unit', 20),
  })
  .superRefine((f, ctx) => {
    if (f.unit && f.type !== 'number') ctx.addIssue({ code: 'custom', path: ['unit'], message: 'Only number fields have a unit' });
  });
export type FieldInput = z.output<typeof FieldInput>;

export const CustomValue = z.union([z.string().max(ASSET_LIMITS.text, `A value must be at most ${ASSET_LIMITS.text} characters`), z.number(), z.boolean(), z.null()], {
  error: 'A value must be text, a number, yes/no or empty',
});
export type CustomValue = z.output<typeof CustomValue>;

export const ApplicatorInput = z
  .object({
    lineId: bodyId('Line'),
    tag: name('Tag', ASSET_LIMITS.tag),
    actuation: z.enum(ACTUATIONS, { error: 'Actuation must be electric or air-operated' }),
    coilDrive: z
      .enum(COIL_DRIVES, { error: `Coil drive must be one of ${COIL_DRIVES.join(', ')}` })
      .nullish()
      .transform((v) => v ?? null),
    airPressureBar: optNumber('Air pressure', 'bar', 0, 16, { minExclusive: true }),
    needleTip: z
      .enum(NEEDLE_TIPS, { error: 'Needle tip must be cone or ball' })
      .nullish()
      .transform((v) => v ?? null),
    needleMaterial: optText('Needle material'),
    seatMaterial: optText('Seat material'),
    orificeDiameterMm: optNumber('Orifice diameter', 'mm', 0, 25, { minExclusive: true }),
    nozzle: optText('Nozzle'),
    fluidFamily: optText('Fluid family', 60),
    fluidName: optText('Fluid name'),
    viscosityMPas: optNumber('Viscosity', 'mPa·s', 0, 1e8, { minExclusive: true }),
    viscosityTemperatureC: optNumber('Viscosity temperature', '°C', -60, 350),
    densityGPerCm3: optNumber('Density', 'g/cm³', 0.1, 25),
    heated: z.boolean({ error: 'Heated must be yes or no' }).default(false),
    setTemperatureC: optNumber('Set temperature', '°C', -60, 350),
    installedOn: PastDate('Install date')
      .nullish()
      .transform((v) => v ?? null),
    status: z.enum(APPLICATOR_STATUSES, { error: `Status must be one of ${APPLICATOR_STATUSES.join(', ')}` }).default('running'),
    cyclesPerMinute: optNumber('Cycle rate', 'cycles/min', 0, 60_000),
    hoursPerDay: optNumber('Running hours', 'h/day', 0, 24),
    daysPerWeek: optNumber('Running days', 'days/week', 0, 7),
    seatIntervalCycles: interval('Seat interval'),
    needleIntervalCycles: interval('Needle interval'),
    sealsIntervalCycles: interval('Seals interval'),
    custom: z.record(z.string().regex(/^\d{1,10}$/, 'Custom fields are keyed by their id'), CustomValue).default({}),
  })
  .superRefine((a, ctx) => {
    const issue = (path: string, message: string) => ctx.addIssue({ code: 'custom', path: [path], message });
    if (a.actuation === 'air-operated' && a.coilDrive) issue('coilDrive', 'An air-operated valve has no coil drive; leave it empty');
    if (a.actuation === 'electric' && a.airPressureBar !== null) issue('airPressureBar', 'An electric valve has no actuating air pressure; leave it empty');
    if (a.viscosityMPas !== null && a.viscosityTemperatureC === null) issue('viscosityTemperatureC', 'Give the temperature the viscosity was measured at');
    if (a.heated && a.setTemperatureC === null) issue('setTemperatureC', 'A heated valve needs its set temperature');
    if (!a.heated && a.setTemperatureC !== null) issue('setTemperatureC', 'Only a heated valve has a set temperature');
    const rate = [a.cyclesPerMinute, a.hoursPerDay, a.daysPerWeek];
    if (rate.some((v) => v !== null) && rate.some((v) => v === null)) {
      const missing = (['cyclesPerMinute', 'hoursPerDay', 'daysPerWeek'] as const).find((k) => a[k] === null)!;
      issue(missing, 'The expected rate needs cycles per minute, hours per day and days per week together');
    }
  });
export type ApplicatorInput = z.output<typeof ApplicatorInput>;

export const ReadingInput = z.object({
  readOn: PastDate('Reading date'),
  count: count('Counter reading'),
  counterReset: z.boolean({ error: 'Counter reset must be yes or no' }).default(false),
  note: optText('Note', ASSET_LIMITS.note),
});
export type ReadingInput = z.output<typeof ReadingInput>;

export const PartUsed = z.object({
  name: name('Part name'),
  partNumber: optText('Part number', 60),
  quantity: z.number({ error: 'Quantity must be a whole number' }).int('Quantity must be a whole number').min(1, 'Quantity must be at least 1').max(999, 'Quantity must be at most 999'),
});
export type PartUsed = z.output<typeof PartUsed>;

export const ServiceEventInput = z
  .object({
    performedOn: PastDate('Service date'),
    actions: z
      .array(z.enum(SERVICE_ACTIONS, { error: `Each action must be one of ${SERVICE_ACTIONS.join(', ')}` }), { error: 'Say what was done' })
      .min(1, 'Say what was done')
      .max(SERVICE_ACTIONS.length)
      .transform((a) => [...new Set(a)]),
    otherAction: optText('What else was done'),
    causeCode: z
      .string({ error: 'Cause must be a cause code' })
      .trim()
      .max(60, 'Cause code is too long')
      .nullish()
      .transform((v) => (v ? v : null)),
    parts: z.array(PartUsed, { error: 'Parts must be a list' }).max(ASSET_LIMITS.parts, `At most ${ASSET_LIMITS.parts} parts`).default([]),
    cycleCount: count('Cycle count')
      .nullish()
      .transform((v) => (v === undefined ? null : v)),
    counterReset: z.boolean({ error: 'Counter reset must be yes or no' }).default(false),
    performedBy: optText('Done by', ASSET_LIMITS.name),
    notes: optText('Notes', ASSET_LIMITS.notes),
    fileIds: z
      .array(z.uuid({ error: 'Each photo must be an uploaded file id' }), { error: 'Photos must be a list of file ids' })
      .max(ASSET_LIMITS.photos, `At most ${ASSET_LIMITS.photos} photos`)
      .default([])
      .transform((ids) => [...new Set(ids.map((x) => x.toLowerCase()))]),
    walkId: bodyId('Walk')
      .nullish()
      .transform((v) => v ?? null),
  })
  .superRefine((e, ctx) => {
    if (e.actions.includes('other') && !e.otherAction) ctx.addIssue({ code: 'custom', path: ['otherAction'], message: 'Say what else was done' });
    if (e.counterReset && e.cycleCount === null) ctx.addIssue({ code: 'custom', path: ['cycleCount'], message: 'A counter reset needs the new counter reading' });
  });
export type ServiceEventInput = z.output<typeof ServiceEventInput>;

export const IMPORT_MODES = ['all-or-nothing', 'valid-only'] as const;
export type ImportMode = (typeof IMPORT_MODES)[number];

/** JSON form of an import; the same endpoints also take the file itself as text/csv. */
export const ImportBody = z.object({
  csv: z.string({ error: 'Send the CSV file' }).min(1, 'The file is empty'),
  mode: z.enum(IMPORT_MODES, { error: `Mode must be one of ${IMPORT_MODES.join(', ')}` }).default('all-or-nothing'),
});
export const ImportModeQuery = z.object({
  mode: z.enum(IMPORT_MODES, { error: `Mode must be one of ${IMPORT_MODES.join(', ')}` }).default('all-or-nothing'),
});

// ---- CSV columns ----------------------------------------------------------------------------

export interface CsvColumn {
  key: string;
  /** Header as exported; headers are matched ignoring case, spaces and punctuation. */
  header: string;
  required: boolean;
  help: string;
}

const col = (key: string, header: string, help: string, required = false): CsvColumn => ({ key, header, help, required });

export const CSV_COLUMNS: Record<ImportKind, CsvColumn[]> = {
  sites: [col('name', 'Site', 'Site name, unique in your organisation', true), col('address', 'Address or area', 'Optional'), col('contact', 'Contact', 'Optional')],
  lines: [col('site', 'Site', 'A site that already exists', true), col('name', 'Line', 'Line name, unique on its site', true), col('area', 'Area', 'Optional'), col('contact', 'Contact', 'Optional')],
  fields: [col('name', 'Field', 'Name of your own applicator field', true), col('type', 'Type', 'text, number, date or yes-no', true), col('unit', 'Unit', 'Number fields only, e.g. ohm')],
  applicators: [
    col('site', 'Site', 'A site that already exists', true),
    col('line', 'Line', 'A line on that site', true),
    col('tag', 'Tag', 'The plant’s asset number, unique on the site', true),
    col('actuation', 'Actuation', 'electric or air-operated', true),
    col('coilDrive', 'Coil drive', '24v-dc, high-voltage or ac (electric valves)'),
    col('airPressureBar', 'Air pressure (bar)', 'Air-operated valves'),
    col('needleTip', 'Needle tip', 'cone or ball'),
    col('needleMaterial', 'Needle material', 'e.g. tungsten carbide'),
    col('seatMaterial', 'Seat material', 'e.g. stainless steel'),
    col('orificeDiameterMm', 'Orifice diameter (mm)', 'Seat orifice'),
    col('nozzle', 'Nozzle', 'Free text'),
    col('fluidFamily', 'Fluid family', 'e.g. hot-melt, cold-glue, silicone'),
    col('fluidName', 'Fluid name', 'Product name as used at the plant'),
    col('viscosityMPas', 'Viscosity (mPa·s)', 'With the temperature it was measured at'),
    col('viscosityTemperatureC', 'Viscosity temperature (°C)', ''),
    col('densityGPerCm3', 'Density (g/cm³)', ''),
    col('heated', 'Heated', 'yes or no'),
    col('setTemperatureC', 'Set temperature (°C)', 'Heated valves'),
    col('installedOn', 'Installed on', 'YYYY-MM-DD'),
    col('status', 'Status', 'running, spare, out-for-repair or retired'),
    col('cyclesPerMinute', 'Expected cycles per minute', 'Expected rate'),
    col('hoursPerDay', 'Expected hours per day', 'Expected rate'),
    col('daysPerWeek', 'Expected days per week', 'Expected rate'),
    col('seatIntervalCycles', 'Seat interval (cycles)', 'Your own figure; empty uses the common-practice default'),
    col('needleIntervalCycles', 'Needle interval (cycles)', 'As above'),
    col('sealsIntervalCycles', 'Seals interval (cycles)', 'As above'),
  ],
  readings: [
    col('site', 'Site', 'The applicator’s site', true),
    col('tag', 'Tag', 'The applicator’s tag', true),
    col('readOn', 'Date', 'YYYY-MM-DD, not in the future', true),
    col('count', 'Count (cycles)', 'Counter value, a whole number', true),
    col('counterReset', 'Counter reset', 'yes when the valve or controller was replaced'),
    col('note', 'Note', 'Optional'),
  ],
};

/** Header of an organisation's own field in the applicators CSV: its name and unit. */
export function customFieldHeader(f: { name: string; unit: string | null }): string {
  return f.unit ? `${f.name} (${f.unit})` : f.name;
}

// ---- Responses ------------------------------------------------------------------------------

export interface SiteView {
  id: number;
  name: string;
  address: string | null;
  contact: string | null;
  lineCount: number;
  applicatorCount: number;
}

export interface LineView {
  id: number;
  siteId: number;
  siteName: string;
  name: string;
  area: string | null;
  contact: string | null;
  applicatorCount: number;
}

export interface FieldView {
  id: number;
  name: string;
  type: FieldType;
  unit: string | null;
  position: number;
}

export interface ApplicatorView {
  id: number;
  siteId: number;
  siteName: string;
  lineId: number;
  lineName: string;
  tag: string;
  actuation: Actuation;
  coilDrive: CoilDrive | null;
  airPressureBar: number | null;
  needleTip: NeedleTip | null;
  needleMaterial: string | null;
  seatMaterial: string | null;
  orificeDiameterMm: number | null;
  nozzle: string | null;
  fluidFamily: string | null;
  fluidName: string | null;
  viscosityMPas: number | null;
  viscosityTemperatureC: number | null;
  densityGPerCm3: number | null;
  heated: boolean;
  setTemperatureC: number | null;
  installedOn: string | null;
  status: ApplicatorStatus;
  cyclesPerMinute: number | null;
  hoursPerDay: number | null;
  daysPerWeek: number | null;
  seatIntervalCycles: number | null;
  needleIntervalCycles: number | null;
  sealsIntervalCycles: number | null;
  custom: Record<string, CustomValue>;
  updatedAt: string;
}

export interface ApplicatorListItem extends ApplicatorView {
  lastReadingOn: string | null;
  lastCount: number | null;
  lastServiceOn: string | null;
}

export interface ReadingView {
  id: number;
  readOn: string;
  count: number;
  counterReset: boolean;
  source: ReadingSource;
  note: string | null;
  /** Cycles since the applicator was installed, carried across counter resets. */
  lifetime: number;
  recordedByName: string | null;
}

export interface ServiceFileView {
  id: string;
  kind: 'photo' | 'document';
  urls: Record<string, string>;
  originalName: string;
}

export interface ServiceEventView {
  id: number;
  performedOn: string;
  actions: ServiceAction[];
  otherAction: string | null;
  causeCode: string | null;
  causeLabel: string | null;
  parts: PartUsed[];
  cycleCount: number | null;
  readingId: number | null;
  performedBy: string | null;
  notes: string | null;
  files: ServiceFileView[];
  walkId: number | null;
  recordedByName: string | null;
  createdAt: string;
}

export interface ApplicatorWalkView {
  id: number;
  guideId: number;
  guideTitle: string;
  symptom: string;
  status: 'open' | 'ended' | 'abandoned';
  outcome: string | null;
  causeCode: string | null;
  causeLabel: string | null;
  userName: string | null;
  startedAt: string;
  endedAt: string | null;
}

export type RateSource = 'readings' | 'expected' | 'none';

export interface CounterSummary {
  lastReadingOn: string | null;
  lastCount: number | null;
  /** Lifetime cycles today: the last reading carried forward at the rate below. */
  estimatedLifetime: number | null;
  /** True when the figure above goes beyond the last reading. */
  estimated: boolean;
  cyclesPerDay: number | null;
  rateSource: RateSource;
  /** No reading within RECENT_READING_DAYS. */
  stale: boolean;
}

export interface ForecastView {
  part: WearPart;
  /** Date of the last service that renewed the part; null when counted from installation. */
  since: string | null;
  cyclesSince: number | null;
  threshold: number;
  /** Whose interval: the applicator's own, the organisation's default, or common practice. */
  thresholdSource: 'applicator' | 'organisation' | 'common-practice';
  cyclesPerDay: number | null;
  daysRemaining: number | null;
  dueOn: string | null;
  status: 'ok' | 'overdue' | 'no-forecast';
  warnings: string[];
}

export interface ApplicatorDetail extends ApplicatorView {
  fields: FieldView[];
  readings: ReadingView[];
  counter: CounterSummary;
  serviceEvents: ServiceEventView[];
  walks: ApplicatorWalkView[];
  forecasts: ForecastView[];
}

export interface ImportProblem {
  /** Spreadsheet row (the header is row 1); null for the file as a whole. */
  row: number | null;
  /** Column header as in the file; null for the whole row. */
  column: string | null;
  message: string;
}

export interface ImportPreview {
  kind: ImportKind;
  delimiter: string;
  columns: string[];
  totalRows: number;
  validRows: number;
  invalidRows: number;
  /** The first rows as read, for the person to check the columns landed right. */
  sample: { row: number; values: Record<string, string>; ok: boolean }[];
  problems: ImportProblem[];
  /** Problems beyond ASSET_LIMITS.importProblems, counted but not listed. */
  moreProblems: number;
}

export interface ImportResult {
  kind: ImportKind;
  imported: number;
  skipped: ImportProblem[];
  skippedRows: number;
}
