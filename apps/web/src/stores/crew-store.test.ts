import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { CrewDaysDto, ScheduleChangedMessage, SessionDto } from '@hodboard/shared';
import * as authApi from '@/api/auth';
import { useCrewStore } from './crew-store';
import { useSessionStore } from './session-store';

vi.mock('@/api/auth', () => ({ signIn: vi.fn(), refreshSession: vi.fn(), signOut: vi.fn() }));
vi.mock('@/api/crew-days', () => ({
  getCrewDays: vi.fn(() => new Promise(() => undefined)),
  takePrefetchedCrewDays: vi.fn(() => null),
  raiseStandDown: vi.fn(),
}));

const lead: SessionDto = {
  accessToken: 'token-1',
  expiresIn: 900,
  user: { id: 'u1', name: 'Orla Penhale', email: 'orla@example.test' },
  firm: { id: 'f1', name: 'Penhale Stoneworks' },
  role: 'crew-lead',
  crewIds: ['c1'],
};

function daysWith(jobId: string | null, today = '2027-03-09', nextDay = '2027-03-10'): CrewDaysDto {
  const day = jobId ? [{ date: nextDay, crewId: 'c1', assignmentId: 'a-old', job: { id: jobId, reference: 'J0100', title: 'Garden wall' } }] : [];
  return { today, nextDay, days: day } as unknown as CrewDaysDto;
}

function pushed(days: string[] | null, crewId = 'c1'): ScheduleChangedMessage {
  return {
    eventId: 7,
    type: 'assignment:moved',
    change: {
      assignment: days ? { id: 'a-1', jobId: 'j1', crewId, startDate: days[0], workingDays: days.length, days, version: 2, updatedBy: null, updatedAt: '' } : null,
      job: { id: 'j1', reference: 'J0100', title: 'Garden wall' },
      crewIds: [crewId],
      actorName: 'Ned Tregear',
    },
  } as unknown as ScheduleChangedMessage;
}

describe('useCrewStore, a schedule push', () => {
  beforeEach(async () => {
    setActivePinia(createPinia());
    vi.mocked(authApi.signIn).mockResolvedValue(lead);
    await useSessionStore().signIn({ email: lead.user.email, password: 'long enough password' });
  });

  it.each([
    ['a one-day job new for tomorrow', null, ['2027-03-10'], 'It is new for tomorrow: on Wed 10 Mar only.'],
    ['a job new for tomorrow over three days', null, ['2027-03-10', '2027-03-11', '2027-03-12'], 'It is new for tomorrow: Wed 10 Mar to Fri 12 Mar.'],
    ["tomorrow's job moved later", 'j1', ['2027-03-15', '2027-03-16'], 'It no longer runs tomorrow: now Mon 15 Mar to Tue 16 Mar.'],
    ["tomorrow's job lengthened", 'j1', ['2027-03-10', '2027-03-11'], 'Its days changed: now Wed 10 Mar to Thu 11 Mar.'],
    ["tomorrow's job taken off the board", 'j1', null, 'It is off the board for now; the office will tell you what comes instead.'],
  ])('says what changed for %s', (_case, tomorrowsJob, days, summary) => {
    const crew = useCrewStore();
    crew.data = daysWith(tomorrowsJob);
    crew.applyEvent(pushed(days));
    expect(crew.nextDayChange).toEqual({ reference: 'J0100', title: 'Garden wall', summary, by: 'Ned Tregear' });
  });

  it('names the weekday when the next working day is after a weekend', () => {
    const crew = useCrewStore();
    // Friday 12 March 2027; the crew's next working day is Monday 15 March.
    crew.data = daysWith(null, '2027-03-12', '2027-03-15');
    expect(crew.nextDayName).toBe('Monday');
    crew.applyEvent(pushed(['2027-03-15']));
    expect(crew.nextDayChange?.summary).toBe('It is new for Monday: on Mon 15 Mar only.');
  });

  it('calls the next working day tomorrow when it is', () => {
    const crew = useCrewStore();
    crew.data = daysWith(null);
    expect(crew.nextDayName).toBe('Tomorrow');
  });

  it("says nothing for another crew's change or one that does not touch tomorrow", () => {
    const crew = useCrewStore();
    crew.data = daysWith(null);
    crew.applyEvent(pushed(['2027-03-10'], 'c2'));
    crew.applyEvent(pushed(['2027-03-15']));
    expect(crew.nextDayChange).toBeNull();
  });
});
