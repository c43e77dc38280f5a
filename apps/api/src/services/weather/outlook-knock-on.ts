import { In, type EntityManager } from 'typeorm';
import { hireCost, planReplan, type OutlookJobKnockOnDto, type OutlookKnockOnDto, type PlacedSpan, type PlannedMove } from '@hodboard/shared';
import { AccessBooking, Assignment, Job } from '../../entities/index.js';
import { hireFor, type AccessService } from '../access-service.js';
import type { FirmCalendars } from '../calendar-service.js';
import { FirmScope } from '../firm-scope.js';

export interface AtRiskDay {
  assignment: Assignment;
  date: string;
}

export const knockOnKey = (assignmentId: string, date: string): string => `${assignmentId}|${date}`;

/**
 * What losing each at-risk day would do, worked out and never written: the job pushed by that one working day with
 * its crew's later jobs rippled along, by the rules a stand-down's re-plan uses (`planReplan`, mode push-and-ripple);
 * the live access bookings that would follow the jobs or need new dates asked of the supplier, decided where the
 * re-plan decides it (`AccessService.accessChangesFor`); and the hire weeks that adds. Keyed by `knockOnKey`.
 */
export async function outlookKnockOns(
  manager: EntityManager, firmId: string, days: readonly AtRiskDay[], calendars: FirmCalendars, access?: AccessService,
): Promise<Map<string, OutlookKnockOnDto | null>> {
  const result = new Map<string, OutlookKnockOnDto | null>();
  if (days.length === 0) return result;
  const scope = new FirmScope(manager, firmId);
  const targets = new Map(days.map((day) => [day.assignment.id, day.assignment]));
  const crewIds = [...new Set([...targets.values()].map((a) => a.crewId))];
  const firstStart = [...targets.values()].reduce((first, a) => (a.startDate < first ? a.startDate : first), days[0]!.assignment.startDate);
  // Every job a ripple could reach: the same crews' jobs from the earliest at-risk job's start on.
  const onCrews = await scope.query(Assignment, 'a').andWhere('a.crew_id IN (:...crewIds) AND a.start_date >= :firstStart', { crewIds, firstStart }).getMany();
  const jobs = await scope.find(Job, {
    where: { id: In([...new Set([...onCrews, ...targets.values()].map((a) => a.jobId))]) },
    select: { id: true, firmId: true, reference: true, earliestStart: true, targetFinish: true },
  });
  const jobById = new Map(jobs.map((job) => [job.id, job]));
  const toSpan = (a: Assignment): PlacedSpan => ({
    assignmentId: a.id, jobId: a.jobId, crewId: a.crewId, startDate: a.startDate, workingDays: a.workingDays, days: a.days,
    earliestStart: jobById.get(a.jobId)?.earliestStart ?? null,
  });

  const plans = days.map((day) => {
    const plan = planReplan({
      target: toSpan(day.assignment), heldDates: [day.date], mode: 'push-and-ripple',
      laterOnCrew: onCrews.filter((a) => a.crewId === day.assignment.crewId).map(toSpan), calendarFor: (crewId) => calendars.forCrew(crewId),
    });
    return { day, moves: plan.moves };
  });

  // Most pushes touch no access at all: ask about bookings only for the pushes that move a job that has one.
  const movedJobIds = [...new Set(plans.flatMap((p) => p.moves.map((m) => m.jobId)))];
  const booked = new Set<string>();
  if (access && movedJobIds.length > 0) {
    const live = await scope.query(AccessBooking, 'b')
      .select(['b.id', 'b.jobIds'])
      .andWhere('b.job_ids && :jobIds::uuid[]', { jobIds: movedJobIds })
      .andWhere("b.state IN ('requested', 'confirmed', 'erected')")
      .getMany();
    for (const booking of live) for (const jobId of booking.jobIds) booked.add(jobId);
  }
  const accessPlans = await Promise.all(plans.map(({ moves }) => {
    if (!access || !moves.some((m) => booked.has(m.jobId))) return [];
    return access.accessChangesFor(manager, firmId, moves.map((m) => m.jobId), calendars, new Map(moves.map((m) => [m.jobId, m.toDays])));
  }));

  const jobKnockOn = (move: PlannedMove): OutlookJobKnockOnDto => {
    const job = jobById.get(move.jobId);
    const finishAfterPush = move.toDays[move.toDays.length - 1]!;
    const targetFinish = job?.targetFinish ?? null;
    return {
      jobId: move.jobId, reference: job?.reference ?? '', finishNow: move.fromDays[move.fromDays.length - 1]!, finishAfterPush, targetFinish,
      passesTargetFinish: targetFinish !== null && finishAfterPush > targetFinish,
    };
  };
  plans.forEach(({ day, moves }, index) => {
    const [own, ...later] = moves;
    if (!own) {
      result.set(knockOnKey(day.assignment.id, day.date), null);
      return;
    }
    const accessKnockOns = accessPlans[index]!.flatMap(({ booking, effect, wanted }) => {
      if (effect === 'settles') return [];
      const isRequested = booking.state === 'requested';
      const terms = { weeklyRate: booking.weeklyRate, minimumWeeks: booking.minimumWeeks };
      const now = hireFor(booking);
      const weeks = now ? Math.max(0, hireCost({ erectBy: wanted.erect, strikeFrom: wanted.strike }, terms).chargedWeeks - now.chargedWeeks) : null;
      return [{
        bookingId: booking.id, accessType: booking.accessType, state: booking.state, needsChangeRequest: effect === 'asks-supplier',
        fromErect: isRequested ? booking.requestedErect : booking.erectedOn ?? booking.confirmedErect,
        fromStrike: isRequested ? booking.requestedStrike : booking.confirmedStrike,
        toErect: wanted.erect, toStrike: wanted.strike,
        extraHireWeeks: weeks, extraHirePence: weeks === null ? null : weeks * booking.weeklyRate,
      }];
    });
    result.set(knockOnKey(day.assignment.id, day.date), {
      job: jobKnockOn(own),
      laterJobs: later.map(jobKnockOn),
      access: accessKnockOns,
      extraHirePence: accessKnockOns.reduce((sum, a) => sum + (a.extraHirePence ?? 0), 0),
    });
  });
  return result;
}
