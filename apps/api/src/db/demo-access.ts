import type { DataSource } from 'typeorm';
import { accessBookingInputSchema, inspectionInputSchema, supplierInputSchema, type AccessBookingDto, type AccessType } from '@hodboard/shared';
import type { Job } from '../entities/index.js';
import { EventBus } from '../lib/event-bus.js';
import type { Actor } from '../services/actor.js';
import { AccessService } from '../services/access-service.js';
import type { Mailer } from '../services/mailer.js';
import { PhotoService } from '../services/photo-service.js';
import { MemoryStorage } from '../services/storage-service.js';

/** Invented hire firms; their names, people and rates are made up for the demo. */
const SUPPLIERS = [
  {
    name: 'Kingsmoor Scaffolding', contactName: 'Donal Reaney', email: 'bookings@kingsmoor-scaffolding.example.org', phone: '01632 960731',
    leadTimeWorkingDays: 5, minimumWeeks: 2, weeklyRates: { scaffold: 22_000, 'edge-protection': 6_500 },
  },
  {
    name: 'Wyvern Access Hire', contactName: 'Sian Abernethy', email: 'hire@wyvern-access.example.org', phone: '01632 960846',
    leadTimeWorkingDays: 2, minimumWeeks: 1, weeklyRates: { tower: 9_500, mewp: 38_000, 'roof-ladder': 2_500 },
  },
] as const;

/** The seed sends nothing: nobody is waiting on these mails. */
const silentMailer: Mailer = { send: async () => undefined };

interface DemoAccessJobs {
  /** Up since the working day before the job began, inspected at handover. */
  erectedScaffold: Job;
  erectedScaffoldToo: Job;
  erectedTower: Job;
  /** Agreed with the supplier for a job a few weeks out. */
  confirmedScaffold: Job;
  /** Asked for, following its job until the supplier confirms. */
  requestedScaffold: Job;
}

/**
 * Two suppliers and a handful of access bookings in the states a newcomer meets in a week: up and inspected at
 * handover, agreed with the supplier, and only asked for. Made through the same service the app uses, after the jobs are placed,
 * so each booking's dates come from its job's days.
 */
export async function seedDemoAccess(dataSource: DataSource, actor: Actor, jobs: DemoAccessJobs): Promise<void> {
  let now = new Date();
  const photos = new PhotoService(dataSource, new MemoryStorage(), new EventBus(), () => now, 'demo-seed-unused');
  const access = new AccessService(dataSource, silentMailer, new EventBus(), () => now, 'http://localhost', photos);
  const suppliers = [];
  for (const supplier of SUPPLIERS) suppliers.push(await access.createSupplier(actor, supplierInputSchema.parse(supplier)));
  const [scaffolds, hire] = suppliers as [(typeof suppliers)[number], (typeof suppliers)[number]];

  const book = (job: Job, accessType: AccessType, supplierId: string, extra: { curingDays?: number; reference?: string; notes?: string } = {}) =>
    access.create(actor, accessBookingInputSchema.parse({ jobIds: [job.id], accessType, supplierId, ...extra }));
  const confirm = (booking: AccessBookingDto) => access.changeState(actor, booking.id, { state: 'confirmed', version: booking.version });
  const putUp = async (booking: AccessBookingDto, handover: { by: string; competentPerson: string; tag: string }) => {
    const erect = booking.confirmedErect!;
    now = new Date(`${erect}T16:00:00Z`);
    const up = await access.changeState(actor, booking.id, {
      state: 'erected', version: booking.version,
      handover: { handedOverOn: erect, handedOverBy: handover.by, competentPersonName: handover.competentPerson, tagReference: handover.tag, notes: null },
    });
    await access.recordInspection(actor, booking.id, inspectionInputSchema.parse({
      inspectedAt: `${erect}T15:30:00Z`, inspectorName: handover.competentPerson, result: 'safe',
      notes: 'Handover inspection before first use: ties, boards, guard rails and toe boards in place; tag signed.',
    }));
    now = new Date();
    return up;
  };

  const stack = await confirm(await book(jobs.erectedScaffold, 'scaffold', scaffolds.id, {
    curingDays: 2, reference: 'KS-4471', notes: 'Independent scaffold to the stack, loading bay on the left lift.',
  }));
  await putUp(stack, { by: 'Donal Reaney', competentPerson: 'Marcus Feld (CISRS scaffolder)', tag: 'KS-4471-A' });

  const elevation = await confirm(await book(jobs.erectedScaffoldToo, 'scaffold', scaffolds.id, {
    curingDays: 2, reference: 'KS-4486', notes: 'Front elevation, three lifts; keep the shop door clear.',
  }));
  await putUp(elevation, { by: 'Donal Reaney', competentPerson: 'Marcus Feld (CISRS scaffolder)', tag: 'KS-4486-A' });

  const tower = await confirm(await book(jobs.erectedTower, 'tower', hire.id, { reference: 'WY-2210', notes: 'Aluminium tower, 6.2 m platform, outriggers fitted.' }));
  await putUp(tower, { by: 'Sian Abernethy', competentPerson: 'Owen Pryce (tower installer)', tag: 'WY-2210-T' });

  await confirm(await book(jobs.confirmedScaffold, 'scaffold', scaffolds.id, { curingDays: 2, reference: 'KS-4502' }));
  await book(jobs.requestedScaffold, 'scaffold', scaffolds.id, { notes: 'Ask for a gin wheel for the old stack bricks.' });
}
