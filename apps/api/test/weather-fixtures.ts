import request from 'supertest';
import type { ForecastHour } from '@hodboard/shared';
import { scenarioHours, type ScenarioName } from '../src/fakes/weather-scenarios.js';
import type { ForecastProvider } from '../src/services/weather/forecast-provider.js';
import type { Harness, SignedIn, populateFirm } from './harness.js';

/** The fake's scenarios served in-process, from a day before the test clock; `isDown` makes it fail like a 503. */
export class ScenarioProvider implements ForecastProvider {
  scenario: ScenarioName = 'calm-week';
  isDown = false;
  constructor(private readonly now: { value: Date }) {}
  async hourly(lat: number, lon: number, days: number): Promise<ForecastHour[]> {
    if (this.isDown) throw new Error('forecast service answered 503');
    return scenarioHours(this.scenario, lat, lon, this.now.value.getTime() - 86_400_000, (days + 1) * 24);
  }
}

/**
 * Turns the populated firm's job into a two-day chimney job with a scaffold, on Thu 25 March 2027 and, after Good
 * Friday and Easter Monday, Tue 30 March; its own booking is cancelled so each test books access as it needs.
 */
export async function chimneyJobOverEaster(h: Harness, owner: SignedIn, ids: Awaited<ReturnType<typeof populateFirm>>): Promise<void> {
  await request(h.app).post(`/api/access-bookings/${ids.bookingId}/state`).set(owner.auth).send({ state: 'cancelled', version: 1 }).expect(200);
  const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
  await request(h.app).put(`/api/jobs/${ids.jobId}`).set(owner.auth)
    .send({ ...job.body, workTypes: ['chimney'], accessNeeds: ['scaffold'], estimatedWorkingDays: 2, version: job.body.version }).expect(200);
  await request(h.app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth)
    .send({ crewId: ids.crewId, startDate: '2027-03-25', workingDays: 2, version: 1 }).expect(200);
}
