// Controlled tags shared by articles and guides: actuation, component and fluid family, plus the
// organisation-wide list of causes that findings carry. Organisations may edit the lists; these
// are the starting values.

export const TAG_GROUPS = ['actuation', 'component', 'fluid'] as const;
export type TagGroup = (typeof TAG_GROUPS)[number];

export const TAG_GROUP_LABELS: Record<TagGroup, string> = {
  actuation: 'Actuation',
  component: 'Component',
  fluid: 'Fluid family',
};

export interface TagDefinition {
  group: TagGroup;
  slug: string;
  label: string;
}

export const DEFAULT_TAGS: TagDefinition[] = [
  { group: 'actuation', slug: 'electric', label: 'Electric (solenoid)' },
  { group: 'actuation', slug: 'air-operated', label: 'Air-operated' },
  { group: 'component', slug: 'seat', label: 'Seat' },
  { group: 'component', slug: 'needle', label: 'Needle' },
  { group: 'component', slug: 'coil', label: 'Coil' },
  { group: 'component', slug: 'spring', label: 'Spring' },
  { group: 'component', slug: 'dynamic-seals', label: 'Dynamic seals' },
  { group: 'component', slug: 'nozzle', label: 'Nozzle' },
  { group: 'component', slug: 'housing-pole-piece', label: 'Housing and pole piece' },
  { group: 'component', slug: 'driver', label: 'Driver' },
  { group: 'component', slug: 'air-valve', label: 'Air valve' },
  { group: 'component', slug: 'filter', label: 'Filter' },
  { group: 'component', slug: 'supply-regulator', label: 'Supply and regulator' },
  { group: 'component', slug: 'heater-hose', label: 'Heater and hose' },
  { group: 'fluid', slug: 'hot-melt', label: 'Hot melt' },
  { group: 'fluid', slug: 'cold-glue', label: 'Cold glue' },
  { group: 'fluid', slug: 'cyanoacrylate', label: 'Cyanoacrylate' },
  { group: 'fluid', slug: 'silicone', label: 'Silicone' },
  { group: 'fluid', slug: 'epoxy', label: 'Epoxy' },
  { group: 'fluid', slug: 'polyurethane', label: 'Polyurethane' },
  { group: 'fluid', slug: 'uv-curing', label: 'UV-curing' },
  { group: 'fluid', slug: 'sealant', label: 'Sealant' },
];

/** Hazards a caution can name; each carries plain words for the panel. */
export const HAZARDS = {
  electrical: 'Electrical energy (including high-voltage coil drivers)',
  'compressed-air': 'Compressed air',
  'fluid-pressure': 'Fluid under pressure',
  injection: 'High-pressure injection through skin',
  heat: 'Hot surfaces and hot melt',
  chemical: 'Chemicals and solvents',
  mechanical: 'Moving parts and stored spring or gravity energy',
} as const;
export type Hazard = keyof typeof HAZARDS;
export const HAZARD_KEYS = Object.keys(HAZARDS) as Hazard[];

export interface CauseDefinition {
  code: string;
  label: string;
  component?: string;
}

export const DEFAULT_CAUSES: CauseDefinition[] = [
  { code: 'seat-debris', label: 'Debris or cured material on the seat', component: 'seat' },
  { code: 'seat-worn', label: 'Seat worn or damaged', component: 'seat' },
  { code: 'needle-chipped', label: 'Needle tip chipped or worn', component: 'needle' },
  { code: 'spring-fatigue', label: 'Spring tired or wrong spring', component: 'spring' },
  { code: 'coil-open', label: 'Coil open circuit', component: 'coil' },
  { code: 'coil-shorted', label: 'Coil shorted turns', component: 'coil' },
  { code: 'coil-overheating', label: 'Coil overheating (duty cycle or no drop to hold)', component: 'coil' },
  { code: 'driver-fault', label: 'Driver fault or wrong drive voltage', component: 'driver' },
  { code: 'dynamic-seal-worn', label: 'Dynamic seal worn', component: 'dynamic-seals' },
  { code: 'seal-incompatible', label: 'Seal material not compatible with the fluid', component: 'dynamic-seals' },
  { code: 'needle-shaft-scored', label: 'Needle shaft scored', component: 'needle' },
  { code: 'regulator-drift', label: 'Supply pressure regulator drift', component: 'supply-regulator' },
  { code: 'fluid-pressure-high', label: 'Fluid pressure too high', component: 'supply-regulator' },
  { code: 'air-pressure-low', label: 'Air pressure low or restricted air supply', component: 'air-valve' },
  { code: 'exhaust-restricted', label: 'Slow exhaust from the air side', component: 'air-valve' },
  { code: 'viscosity-out-of-range', label: 'Viscosity out of range (temperature or batch)' },
  { code: 'temperature-wrong', label: 'Fluid or heater temperature wrong', component: 'heater-hose' },
  { code: 'heater-fault', label: 'Heater fault', component: 'heater-hose' },
  { code: 'air-in-fluid', label: 'Air trapped in the fluid' },
  { code: 'nozzle-blocked', label: 'Nozzle partly blocked or cured', component: 'nozzle' },
  { code: 'filter-blocked', label: 'Filter blocked', component: 'filter' },
  { code: 'supply-empty', label: 'Supply empty or starving', component: 'supply-regulator' },
  { code: 'pot-life', label: 'Material near the end of its pot life' },
  { code: 'line-timing', label: 'Line speed changed without re-timing' },
  { code: 'trigger-moved', label: 'Trigger sensor moved' },
  { code: 'nozzle-distance', label: 'Nozzle too far from the part', component: 'nozzle' },
  { code: 'other', label: 'Other (described in the notes)' },
];
