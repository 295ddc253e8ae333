// Organisation settings: what admins set once for everyone in the organisation. Stored in
// organisations.settings (jsonb); read through orgSettingsFrom so every reader gets the same
// defaults for keys an older row does not have.
import { z } from 'zod';
import { DEFAULT_THRESHOLDS } from '../calculators/service-forecast';

export const UNIT_SYSTEMS = ['metric', 'imperial'] as const;
export type UnitSystem = (typeof UNIT_SYSTEMS)[number];

/** Default replacement intervals in cycles, common practice: seat about 100 million, needle
 * about 500 million, dynamic seals of air-operated valves about half the seat interval. */
export interface ServiceIntervals {
  seatCycles: number;
  needleCycles: number;
  sealsCycles: number;
}

export const COMMON_PRACTICE_INTERVALS: ServiceIntervals = {
  seatCycles: DEFAULT_THRESHOLDS.seat,
  needleCycles: DEFAULT_THRESHOLDS.needle,
  sealsCycles: DEFAULT_THRESHOLDS.seals,
};

const cycles = (label: string) =>
  z
    .number({ error: `${label} must be a number of cycles` })
    .int(`${label} must be a whole number of cycles`)
    .min(1_000, `${label} must be at least 1,000 cycles`)
    .max(1e12, `${label} must be at most 1,000,000,000,000 cycles`);

export const ServiceIntervalsInput = z.object({
  seatCycles: cycles('Seat interval'),
  needleCycles: cycles('Needle interval'),
  sealsCycles: cycles('Seals interval'),
});

export const SettingsInput = z.object({
  allowSelfPublish: z.boolean({ error: 'Allow self-publish must be true or false' }).optional(),
  name: z.string().trim().min(1, 'Organisation name is required').max(120).optional(),
  defaultUnitSystem: z.enum(UNIT_SYSTEMS, { error: 'Default unit system must be metric or imperial' }).optional(),
  /** null puts the common-practice intervals back. */
  serviceIntervals: ServiceIntervalsInput.nullable().optional(),
});
export type SettingsPatch = z.output<typeof SettingsInput>;

export interface OrgSettings {
  name: string;
  allowSelfPublish: boolean;
  defaultUnitSystem: UnitSystem;
  serviceIntervals: ServiceIntervals;
  /** True when the organisation has not set its own intervals. */
  serviceIntervalsAreDefault: boolean;
}

export function orgSettingsFrom(row: { name: string; settings: Record<string, unknown> | null }): OrgSettings {
  const s = row.settings ?? {};
  const own = ServiceIntervalsInput.safeParse(s.serviceIntervals);
  const unit = z.enum(UNIT_SYSTEMS).safeParse(s.defaultUnitSystem);
  return {
    name: row.name,
    allowSelfPublish: Boolean(s.allowSelfPublish),
    defaultUnitSystem: unit.success ? unit.data : 'metric',
    serviceIntervals: own.success ? own.data : { ...COMMON_PRACTICE_INTERVALS },
    serviceIntervalsAreDefault: !own.success,
  };
}
