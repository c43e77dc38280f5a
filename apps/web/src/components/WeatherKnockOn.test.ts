import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import type { OutlookKnockOnDto } from '@hodboard/shared';
import WeatherKnockOn from './WeatherKnockOn.vue';

const knockOn = (overrides: Partial<OutlookKnockOnDto> = {}): OutlookKnockOnDto => ({
  job: { jobId: 'j1', reference: 'J0042', finishNow: '2027-03-30', finishAfterPush: '2027-03-31', targetFinish: '2027-03-30', passesTargetFinish: true },
  laterJobs: [{ jobId: 'j2', reference: 'J0043', finishNow: '2027-04-01', finishAfterPush: '2027-04-02', targetFinish: '2027-04-05', passesTargetFinish: false }],
  access: [{
    bookingId: 'b1', accessType: 'scaffold', state: 'confirmed', needsChangeRequest: true, fromErect: '2027-03-24', fromStrike: '2027-03-31',
    toErect: '2027-03-24', toStrike: '2027-04-01', extraHireWeeks: 1, extraHirePence: 12_000,
  }],
  extraHirePence: 12_000,
  ...overrides,
});
const lines = (k: OutlookKnockOnDto) => mount(WeatherKnockOn, { props: { knockOn: k } }).findAll('li').map((li) => [li.attributes('data-kind'), li.text()]);

describe('WeatherKnockOn', () => {
  it('says in words what losing the day does to the finish, the promise, the next job and the scaffold hire', () => {
    expect(lines(knockOn())).toEqual([
      ['finish', 'Losing this day moves the finish from Tue 30 Mar to Wed 31 Mar: past the finish promised to the client, Tue 30 Mar.'],
      ['later', 'J0043 follows on, finishing Fri 2 Apr instead of Thu 1 Apr: still within the finish promised, Mon 5 Apr.'],
      ['access', 'Scaffold (confirmed): the supplier would be asked for new dates, up Wed 24 Mar, down Thu 1 Apr instead of Wed 24 Mar – Wed 31 Mar. 1 week more hire: £120.00.'],
    ]);
  });

  it('tells a late job from one the push makes late, a request that follows from one that asks, and sums the hire of several bookings', () => {
    const text = lines(knockOn({
      job: { jobId: 'j1', reference: 'J0042', finishNow: '2027-04-01', finishAfterPush: '2027-04-02', targetFinish: '2027-03-30', passesTargetFinish: true },
      laterJobs: [],
      access: [
        { bookingId: 'b1', accessType: 'scaffold', state: 'requested', needsChangeRequest: false, fromErect: '2027-03-24', fromStrike: '2027-04-02', toErect: '2027-03-24', toStrike: '2027-04-05', extraHireWeeks: 0, extraHirePence: 0 },
        { bookingId: 'b2', accessType: 'scaffold', state: 'erected', needsChangeRequest: true, fromErect: '2027-03-01', fromStrike: '2027-04-02', toErect: '2027-03-01', toStrike: '2027-04-05', extraHireWeeks: 2, extraHirePence: 30_000 },
      ],
      extraHirePence: 30_000,
    })).map(([, t]) => t);
    expect(text[0]).toBe('Losing this day moves the finish from Thu 1 Apr to Fri 2 Apr: already past the finish promised, Tue 30 Mar, and later still.');
    expect(text[1]).toMatch(/: the request follows the job, up Wed 24 Mar, down Mon 5 Apr instead of .*\. No extra hire weeks\.$/);
    expect(text[2]).toMatch(/: the supplier would be asked for new dates, .* 2 weeks more hire: £300\.00\.$/);
    expect(text[3]).toBe('Extra hire in all: £300.00.');
  });

  it('leaves the promise out when there is none, and says so when the hire has no dates', () => {
    const text = lines(knockOn({
      job: { jobId: 'j1', reference: 'J0042', finishNow: '2027-03-30', finishAfterPush: '2027-03-31', targetFinish: null, passesTargetFinish: false },
      laterJobs: [],
      access: [{ bookingId: 'b1', accessType: 'scaffold', state: 'requested', needsChangeRequest: false, fromErect: null, fromStrike: null, toErect: '2027-03-25', toStrike: '2027-04-01', extraHireWeeks: null, extraHirePence: null }],
      extraHirePence: 0,
    })).map(([, t]) => t);
    expect(text).toEqual([
      'Losing this day moves the finish from Tue 30 Mar to Wed 31 Mar.',
      expect.stringMatching(/the request follows the job, up Thu 25 Mar, down Thu 1 Apr\. The hire has no dates yet, so its cost is not worked out\.$/),
    ]);
  });

  it('sums up several following jobs in one line, with the list behind it, and counts those pushed past a promise', () => {
    const wrapper = mount(WeatherKnockOn, {
      props: {
        knockOn: knockOn({
          laterJobs: [
            { jobId: 'j2', reference: 'J0043', finishNow: '2027-04-01', finishAfterPush: '2027-04-02', targetFinish: '2027-04-05', passesTargetFinish: false },
            { jobId: 'j3', reference: 'J0044', finishNow: '2027-04-06', finishAfterPush: '2027-04-07', targetFinish: '2027-04-06', passesTargetFinish: true },
          ],
          access: [],
          extraHirePence: 0,
        }),
      },
    });
    const summary = wrapper.find('[data-kind="later-summary"] summary');
    expect(summary.text()).toBe('2 later jobs of this crew follow on, the last finishing Wed 7 Apr instead of Tue 6 Apr; 1 past a finish promised to the client.');
    expect(summary.classes()).toContain('is-warn');
    expect(wrapper.findAll('[data-kind="later-summary"] li').map((li) => li.text())).toEqual([
      'J0043 follows on, finishing Fri 2 Apr instead of Thu 1 Apr: still within the finish promised, Mon 5 Apr.',
      'J0044 follows on, finishing Wed 7 Apr instead of Tue 6 Apr: past the finish promised to the client, Tue 6 Apr.',
    ]);
  });
});
