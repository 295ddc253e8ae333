// Demo mode only: a morning's worth of invented support desk cases for the demo organisation, in
// every state the queue shows, dated relative to now. Idempotent: skipped when it has cases.
import type { Knex } from 'knex';
import { DEMO_ORGANISATION } from './01-demo-organisation';

const MINUTE = 60_000;
const ago = (minutes: number) => new Date(Date.now() - minutes * MINUTE);

interface DemoEvent {
  kind: 'note' | 'status' | 'assigned' | 'handoff';
  after: number;
  text?: string;
  from?: string;
  to?: string;
  assignee?: string;
}

interface DemoCase {
  callerName: string;
  callerCompany: string | null;
  callerPhone: string | null;
  callerEmail: string | null;
  site: string;
  line: string | null;
  applicator: string | null;
  symptom: string;
  priority: 'low' | 'normal' | 'high' | 'urgent';
  status: 'new' | 'in-progress' | 'waiting' | 'handed-off' | 'resolved' | 'closed';
  minutesAgo: number;
  assignee?: string;
  events: DemoEvent[];
}

const CASES: DemoCase[] = [
  {
    callerName: 'Bea Thornton',
    callerCompany: null,
    callerPhone: '+44 1632 960 214',
    callerEmail: 'bea.thornton@example.com',
    site: 'Mill Road plant',
    line: 'Line 3 (carton sealing)',
    applicator: 'V-312',
    symptom: 'Hot melt drools from the nozzle after the line stops',
    priority: 'high',
    status: 'new',
    minutesAgo: 35,
    events: [],
  },
  {
    callerName: 'Marta Keel',
    callerCompany: null,
    callerPhone: '+44 1632 960 330',
    callerEmail: null,
    site: 'Wharf Street plant',
    line: 'Line 1 (case erecting)',
    applicator: null,
    symptom: 'Valve slow to close after the lunch break',
    priority: 'normal',
    status: 'in-progress',
    minutesAgo: 5 * 60,
    assignee: 'support@example.com',
    events: [
      { kind: 'assigned', after: 2, assignee: 'support@example.com' },
      { kind: 'status', after: 3, from: 'new', to: 'in-progress' },
      { kind: 'note', after: 20, text: 'Shift lead reads the air pressure at the valve after the break and calls back.' },
    ],
  },
  {
    callerName: 'Joel Ambrose',
    callerCompany: 'Harrowgate Bottling (demo)',
    callerPhone: '+44 1632 960 571',
    callerEmail: 'joel.ambrose@example.net',
    site: 'Harrowgate bottling hall',
    line: 'Labeller 2',
    applicator: null,
    symptom: 'Label glue dots get smaller through the shift',
    priority: 'normal',
    status: 'waiting',
    minutesAgo: 2 * 24 * 60,
    events: [
      { kind: 'note', after: 15, text: 'Asked for the tank temperature log of the last three shifts.' },
      { kind: 'status', after: 16, from: 'new', to: 'waiting', text: 'Waiting for the temperature log.' },
    ],
  },
  {
    callerName: 'Nia Calder',
    callerCompany: null,
    callerPhone: '+44 1632 960 338',
    callerEmail: 'nia.calder@example.com',
    site: 'Wharf Street plant',
    line: 'Line 2 (labelling)',
    applicator: null,
    symptom: 'Coil too hot to touch after an hour',
    priority: 'urgent',
    status: 'handed-off',
    minutesAgo: 26 * 60,
    assignee: 'author@example.com',
    events: [
      { kind: 'status', after: 4, from: 'new', to: 'in-progress' },
      {
        kind: 'handoff',
        after: 30,
        from: 'in-progress',
        to: 'handed-off',
        assignee: 'author@example.com',
        text: 'Coil reads 24 V with the signal off between shots; driver may not drop to hold. Please call Nia before the night shift.',
      },
    ],
  },
  {
    callerName: 'Sid Okoro',
    callerCompany: 'Fenmoor Dairy (demo)',
    callerPhone: null,
    callerEmail: 'sid.okoro@example.net',
    site: 'Fenmoor cup filling',
    line: 'Lidder 1',
    applicator: null,
    symptom: 'Seal weeping at the valve body',
    priority: 'low',
    status: 'resolved',
    minutesAgo: 9 * 24 * 60,
    events: [
      { kind: 'status', after: 10, from: 'new', to: 'in-progress' },
      { kind: 'note', after: 40, text: 'Seal kit fitted by their own technician; weeping stopped.' },
      { kind: 'status', after: 45, from: 'in-progress', to: 'resolved' },
    ],
  },
];

export async function seed(knex: Knex): Promise<void> {
  if (process.env.BEADPATH_DEMO !== '1') return;
  const org = await knex('organisations').where({ name: DEMO_ORGANISATION }).first();
  if (!org) return;
  if (await knex('cases').where({ organisation_id: org.id }).first()) return;
  const users = new Map<string, { id: number; name: string }>(
    (await knex('users').where({ organisation_id: org.id }).select('id', 'email', 'name')).map((u: { id: number; email: string; name: string }) => [u.email, u]),
  );
  const desk = users.get('support@example.com');
  if (!desk) return;
  const hasApplicators = await knex.schema.hasTable('applicators');

  await knex.transaction(async (trx) => {
    for (const c of CASES) {
      const created = ago(c.minutesAgo);
      const assignee = c.assignee ? users.get(c.assignee) : undefined;
      const valve = hasApplicators && c.applicator ? await trx('applicators').where({ organisation_id: org.id, tag: c.applicator }).first('id') : undefined;
      const last = c.events.at(-1);
      const updated = last ? new Date(created.getTime() + last.after * MINUTE) : created;
      const [row] = await trx('cases')
        .insert({
          organisation_id: org.id,
          caller_name: c.callerName,
          caller_company: c.callerCompany,
          caller_phone: c.callerPhone,
          caller_email: c.callerEmail,
          site: c.site,
          line: c.line,
          applicator: c.applicator,
          applicator_id: valve?.id ?? null,
          symptom: c.symptom,
          priority: c.priority,
          status: c.status,
          assignee_id: assignee?.id ?? null,
          created_by: desk.id,
          handed_off_at: c.events.find((e) => e.kind === 'handoff') ? updated : null,
          resolved_at: c.status === 'resolved' ? updated : null,
          created_at: created,
          updated_at: updated,
        })
        .returning('id');
      await trx('case_events').insert({ case_id: row.id, kind: 'created', user_id: desk.id, to_status: 'new', text: `Call logged: ${c.symptom}`, created_at: created });
      for (const e of c.events) {
        await trx('case_events').insert({
          case_id: row.id,
          kind: e.kind,
          user_id: desk.id,
          text: e.text ?? null,
          from_status: e.from ?? null,
          to_status: e.to ?? null,
          assignee_id: e.assignee ? (users.get(e.assignee)?.id ?? null) : null,
          created_at: new Date(created.getTime() + e.after * MINUTE),
        });
        if (e.kind === 'handoff' && assignee) {
          await trx('notices').insert({
            organisation_id: org.id,
            user_id: assignee.id,
            case_id: row.id,
            kind: 'handoff',
            title: `Case ${row.id} handed to you by ${desk.name}`,
            body: `${c.symptom} at ${c.site}. ${e.text ?? ''}`.trim(),
            created_at: new Date(created.getTime() + e.after * MINUTE),
          });
        }
      }
    }
  });
}
