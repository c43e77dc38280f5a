import argon2 from 'argon2';
import type { DataSource, EntityManager } from 'typeorm';
import { addDays, isoWeekday, isWorkingDay, publicHolidays, type AccessNeed, type ClientContact, type Role, type TimeOffValues, type WorkType } from '@hodboard/shared';
import { EventBus } from '../lib/event-bus.js';
import { seedDemoAccess } from './demo-access.js';
import { seedDemoQuotes } from './demo-quotes.js';
import { todayIn } from '../lib/today.js';
import type { Actor } from '../services/actor.js';
import { ScheduleService } from '../services/schedule-service.js';
import { TimeOffService } from '../services/time-off-service.js';
import { Client, Crew, CrewMember, Firm, Job, Membership, Site, SiteNote, User } from '../entities/index.js';

/** An invented firm for demos and browser tests; none of these people or addresses exist. */
export const DEMO_PASSWORD = 'Demo-pass-2026';
export const DEMO_SIGN_INS: Array<{ role: Role; name: string; email: string }> = [
  { role: 'owner', name: 'Ruth Brindle', email: 'owner@demo.hodboard.test' },
  { role: 'office', name: 'Dev Okafor', email: 'office@demo.hodboard.test' },
  { role: 'crew-lead', name: 'Callum Frayne', email: 'lead@demo.hodboard.test' },
  { role: 'operative', name: 'Nia Pettigrew', email: 'operative@demo.hodboard.test' },
];

const EXTRA_PEOPLE: Array<{ role: Role; name: string; email: string }> = [
  { role: 'crew-lead', name: 'Marek Sowinski', email: 'marek@demo.hodboard.test' },
  { role: 'operative', name: 'Josh Telford', email: 'josh@demo.hodboard.test' },
  { role: 'crew-lead', name: 'Ifan Rhys-Morgan', email: 'ifan@demo.hodboard.test' },
  { role: 'operative', name: 'Priya Lomas', email: 'priya@demo.hodboard.test' },
  { role: 'crew-lead', name: 'Bea Castellano', email: 'bea@demo.hodboard.test' },
  { role: 'operative', name: 'Tomasz Wrona', email: 'tomasz@demo.hodboard.test' },
];

const TOWNS = [
  { town: 'Callowmere', prefix: 'CM' },
  { town: 'Greenhythe', prefix: 'GH' },
  { town: 'Thornley Edge', prefix: 'TE' },
  { town: 'Saltby Cross', prefix: 'SX' },
];

const CLIENTS = [
  ['Helen Ashdown', '14 Quarry Row', 'Side gate, code 4471. Park on the verge, not the drive.', 'Overhead phone line to the chimney stack.'],
  ['Greenhythe Parish Council', 'Churchyard wall, Mill Lane', 'Key to the lychgate from the clerk.', 'Public footpath alongside: barrier the work area.'],
  ['Oduya & Finch Lettings', '3 Tannery Court', 'Tenant works nights; knock after 10:00.', null],
  ['Graham and Lise Pennock', 'Old Forge Cottage, Top Road', 'Steep drive; no lorries over 7.5 t.', 'Soft lime mortar throughout: no cement pointing.'],
  ['Bramcote Primary School', 'School Lane', 'Work after 16:00 or in the holidays. Sign in at reception.', 'Children on site in term time.'],
  ['Ravi and Jo Mistry', '8 Heron Close', 'Drive is free for the skip.', null],
  ['Wendell Okoro', '41 Candle Street', 'Terrace: access through the back lane only.', 'Fragile glass lean-to below the stack.'],
  ['The Saltby Arms', 'Market Place', 'Deliveries before 11:00, the yard fills after.', 'Cellar hatch in the pavement.'],
  ['Marguerite Dunne', 'Lark Rise Farmhouse', 'Farm track: 4x4 in wet weather.', 'Livestock in the next field; close gates.'],
  ['Callowmere Housing Co-operative', 'Block C, Weavers Yard', 'Caretaker Pat on 07700 900488 has the keys.', 'Asbestos register in the caretaker office: check before drilling.'],
  ['Stefan Holm', '2 Chapel Walk', 'Narrow lane: park at the chapel.', null],
  ['Eileen Carrow', '19 Orchard Rise', 'Dog in the garden: call ahead.', null],
] as const;

/** Second and third people to reach at some clients; the first contact comes from the client list above. */
const MORE_CONTACTS: Record<string, ClientContact[]> = {
  'Greenhythe Parish Council': [{ name: 'Alys Brennan', role: 'Clerk to the council', email: 'clerk@greenhythe-pc.example.org', phone: '07700 900631' }],
  'Oduya & Finch Lettings': [
    { name: 'Kemi Oduya', role: 'Letting agent', email: 'kemi@oduyafinch.example.org', phone: null },
    { name: 'Sam Whitlow', role: 'Tenant', email: null, phone: '07700 900644' },
  ],
  'Bramcote Primary School': [{ name: 'Gareth Lyle', role: 'Site manager', email: null, phone: '07700 900657' }],
  'Callowmere Housing Co-operative': [{ name: 'Pat Ingle', role: 'Caretaker', email: null, phone: '07700 900488' }],
};

const JOB_KINDS: Array<{ title: string; workTypes: WorkType[]; days: number; access: AccessNeed[] }> = [
  { title: 'Rebuild chimney stack above roof line', workTypes: ['chimney'], days: 4, access: ['scaffold'] },
  { title: 'Repoint front elevation', workTypes: ['repointing'], days: 5, access: ['scaffold'] },
  { title: 'Rebuild collapsed garden wall', workTypes: ['garden-wall', 'brickwork'], days: 3, access: [] },
  { title: 'Lime repointing to gable end', workTypes: ['repointing'], days: 4, access: ['tower'] },
  { title: 'Replace chimney pots and flaunching', workTypes: ['chimney', 'repairs'], days: 1, access: ['roof-ladder'] },
  { title: 'Brick boundary wall with piers', workTypes: ['garden-wall', 'brickwork'], days: 6, access: [] },
  { title: 'Render repair to rear wall', workTypes: ['rendering', 'repairs'], days: 2, access: ['tower'] },
  { title: 'Single-storey extension: footings', workTypes: ['extension', 'groundworks', 'concrete'], days: 3, access: [] },
  { title: 'Single-storey extension: brickwork to plate', workTypes: ['extension', 'brickwork'], days: 6, access: [] },
  { title: 'Take down and cap redundant stack', workTypes: ['chimney'], days: 2, access: ['scaffold'] },
  { title: 'Replace spalled bricks and repoint bay', workTypes: ['brickwork', 'repointing'], days: 2, access: [] },
  { title: 'Rebuild garden steps and retaining wall', workTypes: ['garden-wall', 'groundworks'], days: 4, access: [] },
];

const CREWS = [
  { name: 'Stack crew', colour: '#9c4221', lead: 'lead@demo.hodboard.test', members: ['lead@demo.hodboard.test', 'operative@demo.hodboard.test'] },
  { name: 'Wall crew', colour: '#2f6f6a', lead: 'marek@demo.hodboard.test', members: ['marek@demo.hodboard.test', 'josh@demo.hodboard.test'] },
  { name: 'Pointing crew', colour: '#5b4b8a', lead: 'ifan@demo.hodboard.test', members: ['ifan@demo.hodboard.test', 'priya@demo.hodboard.test'] },
  { name: 'Extension crew', colour: '#7a6a1f', lead: 'bea@demo.hodboard.test', members: ['bea@demo.hodboard.test', 'tomasz@demo.hodboard.test'] },
];

/**
 * Creates the demo firm once: people, four crews, clients and sites, then about forty jobs of which most are
 * placed over the six weeks from the current week, through the same services the app uses, with some leave,
 * a closure and a few deliberate conflicts so a newcomer sees a living board.
 */
export async function seedDemoFirm(dataSource: DataSource, today: string = todayIn('Europe/London')): Promise<{ created: boolean }> {
  const owner = DEMO_SIGN_INS[0]!;
  if (await dataSource.manager.existsBy(User, { email: owner.email })) return { created: false };
  const passwordHash = await argon2.hash(DEMO_PASSWORD, { type: argon2.argon2id });
  // All or nothing: a seed that fails part-way (or a second one racing it) leaves no half-built firm behind that a
  // later run would take for a finished one.
  return dataSource.transaction(async (manager) => {
    if (await manager.existsBy(User, { email: owner.email })) return { created: false };
    await seedInto(withinTransaction(dataSource, manager), passwordHash, today);
    return { created: true };
  });
}

/**
 * The data source as the services see it, bound to one open transaction: their own transactions become savepoints
 * inside it and their reads see its uncommitted rows.
 */
function withinTransaction(dataSource: DataSource, manager: EntityManager): DataSource {
  return Object.create(dataSource, {
    manager: { value: manager },
    transaction: { value: manager.transaction.bind(manager) },
    query: { value: manager.query.bind(manager) },
    createQueryBuilder: { value: manager.createQueryBuilder.bind(manager) },
    getRepository: { value: manager.getRepository.bind(manager) },
  }) as DataSource;
}

/**
 * Most of the year no bank holiday falls in the six weeks shown, so one more job is booked over the next one, where
 * its span skips the holiday. On the first crew free by then, the working day before, so it runs over the holiday;
 * not on the crew whose alternate Fridays off could fall on that day.
 */
async function placeOverNextBankHoliday(
  schedule: ScheduleService, actor: Actor, job: Job, crews: Crew[], freeFrom: Map<string, string>, shown: { from: string; to: string },
): Promise<void> {
  const year = Number(shown.from.slice(0, 4));
  const holidays = [...publicHolidays(year), ...publicHolidays(year + 1)].map((holiday) => holiday.date);
  if (holidays.some((date) => date >= shown.from && date <= shown.to)) return;
  for (const holiday of holidays.filter((date) => date > shown.to)) {
    let dayBefore = addDays(holiday, -1);
    while (!isWorkingDay(dayBefore)) dayBefore = addDays(dayBefore, -1);
    const crew = crews.find((candidate) => freeFrom.get(candidate.id)! <= dayBefore);
    if (crew) {
      await schedule.place(actor, { jobId: job.id, crewId: crew.id, startDate: dayBefore, confirmDoubleBooking: false });
      return;
    }
  }
}

async function seedInto(dataSource: DataSource, passwordHash: string, today: string): Promise<void> {
  const owner = DEMO_SIGN_INS[0]!;
  const base = await dataSource.transaction(async (manager) => {
    const firm = await manager.save(manager.create(Firm, {
      name: 'Brindle & Frayne Masonry',
      email: 'office@brindlefrayne.example.org',
      phone: '01632 960555',
      address: 'Unit 4, Kiln Yard, Callowmere CM2 8KY',
    }));
    const members = new Map<string, Membership>();
    for (const person of [...DEMO_SIGN_INS, ...EXTRA_PEOPLE]) {
      const user = await manager.save(manager.create(User, { email: person.email, name: person.name, passwordHash }));
      members.set(person.email, await manager.save(manager.create(Membership, { firmId: firm.id, userId: user.id, role: person.role, status: 'active' })));
    }
    const crews: Crew[] = [];
    for (const crew of CREWS) {
      const saved = await manager.save(manager.create(Crew, { firmId: firm.id, name: crew.name, colour: crew.colour, leadMemberId: members.get(crew.lead)!.id }));
      await manager.insert(CrewMember, crew.members.map((email) => ({ crewId: saved.id, memberId: members.get(email)!.id, firmId: firm.id })));
      crews.push(saved);
    }
    const sites: Site[] = [];
    for (const [index, [name, street, accessNotes, hazards]] of CLIENTS.entries()) {
      const place = TOWNS[index % TOWNS.length]!;
      const main = {
        name: name.includes('&') || name.includes('Council') ? null : name, role: null,
        email: `${name.toLowerCase().replace(/[^a-z]+/g, '.').replace(/^\.|\.$/g, '')}@example.org`,
        phone: `07700 900${String(100 + index * 7).padStart(3, '0')}`,
      };
      const client = await manager.save(manager.create(Client, {
        firmId: firm.id, name, contacts: [main, ...(MORE_CONTACTS[name] ?? [])], notes: null,
      }));
      sites.push(await manager.save(manager.create(Site, {
        firmId: firm.id, clientId: client.id, addressLine1: street, addressLine2: null, town: place.town,
        postcode: `${place.prefix}${(index % 9) + 1} ${(index % 8) + 1}${'ABDEFGHJ'[index % 8]}${'LNPQRSTU'[(index * 3) % 8]}`,
        accessNotes, hazards,
      })));
    }
    const ownerMembership = members.get(owner.email)!;
    const jobs: Job[] = [];
    for (let i = 0; i < 40; i += 1) {
      const kind = JOB_KINDS[i % JOB_KINDS.length]!;
      const site = sites[(i * 5) % sites.length]!;
      jobs.push(await manager.save(manager.create(Job, {
        firmId: firm.id, reference: `J${String(i + 1).padStart(4, '0')}`, clientId: site.clientId, siteId: site.id,
        title: kind.title, description: null, workTypes: kind.workTypes, estimatedWorkingDays: kind.days, accessNeeds: kind.access,
        status: i >= 36 ? (i % 2 ? 'enquiry' : 'quoted') : 'booked', priority: i % 9 === 0 ? 'high' : i % 13 === 0 ? 'urgent' : 'normal',
        siteNotes: i % 4 === 0 ? 'Materials delivered to the front drive; cover the pallets overnight.' : null,
        earliestStart: null, targetFinish: null,
      })));
    }
    await manager.update(Firm, { id: firm.id }, { jobSequence: jobs.length });
    return { firm, members, crews, jobs, ownerMembership };
  });

  const actor: Actor = {
    userId: base.ownerMembership.userId, firmId: base.firm.id, membershipId: base.ownerMembership.id, role: 'owner', crewIds: [],
  };
  const events = new EventBus();
  const timeOff = new TimeOffService(dataSource, events);
  const schedule = new ScheduleService(dataSource, events);
  const monday = addDays(today, 1 - isoWeekday(today));
  const shown = { from: monday, to: addDays(monday, 6 * 7 - 1) };
  const alternateFridaysCrew = base.crews[1]!;
  await timeOff.create(actor, timeOffValues({ scope: 'firm', label: 'Firm training day', startDate: addDays(monday, 24), endDate: addDays(monday, 24) }));
  await timeOff.create(actor, timeOffValues({ scope: 'crew', crewId: alternateFridaysCrew.id, label: 'Alternate Fridays', startDate: addDays(monday, 4), endDate: addDays(monday, 4), repeats: 'fortnightly' }));
  await timeOff.create(actor, timeOffValues({ scope: 'member', memberId: base.members.get('operative@demo.hodboard.test')!.id, label: 'Holiday', startDate: addDays(monday, 14), endDate: addDays(monday, 18) }));

  // Thirty-odd jobs placed back to back on each crew's own calendar; the last few stay in the tray.
  const cursors = new Map(base.crews.map((crew) => [crew.id, monday]));
  for (const [index, job] of base.jobs.slice(0, 32).entries()) {
    const crew = base.crews[index % base.crews.length]!;
    const change = await schedule.place(actor, { jobId: job.id, crewId: crew.id, startDate: cursors.get(crew.id)!, confirmDoubleBooking: false });
    cursors.set(crew.id, addDays(change.assignment!.days.at(-1)!, 1));
  }
  // Deliberate conflicts for the demo: a double booking the office confirmed, and a job before its earliest start.
  await schedule.place(actor, { jobId: base.jobs[32]!.id, crewId: base.crews[0]!.id, startDate: addDays(monday, 8), confirmDoubleBooking: true });
  await dataSource.manager.update(Job, { id: base.jobs[33]!.id }, { earliestStart: addDays(monday, 21) });
  await schedule.place(actor, { jobId: base.jobs[33]!.id, crewId: base.crews[2]!.id, startDate: addDays(monday, 15), confirmDoubleBooking: true });
  await placeOverNextBankHoliday(schedule, actor, base.jobs[34]!, base.crews.filter((crew) => crew !== alternateFridaysCrew), cursors, shown);
  await seedSiteNotes(dataSource, base.firm.id, base.jobs, base.members);
  const job = (reference: string) => base.jobs.find((candidate) => candidate.reference === reference)!;
  await seedDemoAccess(dataSource, actor, {
    erectedScaffold: job('J0001'), erectedScaffoldToo: job('J0002'), erectedTower: job('J0004'), confirmedScaffold: job('J0013'), requestedScaffold: job('J0010'),
  });
  await seedDemoQuotes(dataSource, actor, { accepted: job('J0001'), sent: base.jobs[36]!, draft: base.jobs[38]! });
}

/** A few notes on the Stack crew's first jobs, as a crew's phone would have left them. */
async function seedSiteNotes(dataSource: DataSource, firmId: string, jobs: Job[], members: Map<string, Membership>): Promise<void> {
  const lead = members.get('lead@demo.hodboard.test')!.userId;
  const operative = members.get('operative@demo.hodboard.test')!.userId;
  const office = members.get('office@demo.hodboard.test')!.userId;
  const notes: Array<[number, string, string, 'office' | 'crew', number]> = [
    [0, 'Scaffold tag checked and signed this morning. Loading bay on the left lift.', lead, 'crew', 26],
    [0, 'Client asked us to keep the side path clear for the bins on Thursdays.', office, 'office', 50],
    [4, 'Old pots are cracked through; two new ones ordered, due on site day two.', lead, 'crew', 5],
    [4, 'Neighbour at no. 16 is fine with us using their drive for the mixer.', operative, 'crew', 2],
    [8, 'Lime putty delivered and stored in the garage, lids on.', operative, 'crew', 3],
  ];
  const now = Date.now();
  for (const [index, body, authorUserId, authorRole, hoursAgo] of notes) {
    const job = jobs[index];
    if (!job) continue;
    await dataSource.manager.save(dataSource.manager.create(SiteNote, {
      firmId, jobId: job.id, body, authorUserId, authorRole, idempotencyKey: null, createdAt: new Date(now - hoursAgo * 3_600_000),
    }));
  }
}

function timeOffValues(values: Partial<TimeOffValues> & Pick<TimeOffValues, 'scope' | 'label' | 'startDate' | 'endDate'>): TimeOffValues {
  return { crewId: null, memberId: null, repeats: 'none', repeatUntil: null, notes: null, ...values };
}
