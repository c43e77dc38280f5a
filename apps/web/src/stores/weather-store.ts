import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import type {
  DayWeatherDto,
  ReplanInput,
  ReplanPreviewDto,
  ResourceChangedMessage,
  ScheduleChangeDto,
  WeatherHoldDto,
  WeatherHoldInput,
  WeatherOutlookDto,
} from '@hodboard/shared';
import * as weatherApi from '@/api/weather';
import type { RealtimeClient } from '@/realtime/socket';
import { compareCodes } from '@/utils/compare';

export type Verdict = DayWeatherDto['verdict'];

/** Hodboard's own words for a day's verdict; the icon and the word always travel together, never colour alone. */
export const verdictLabels: Record<Verdict, { short: string; long: string; icon: string }> = {
  go: { short: 'Fine', long: 'Fine to work', icon: 'pi pi-check-circle' },
  caution: { short: 'Watch', long: 'Work with care', icon: 'pi pi-exclamation-triangle' },
  stop: { short: 'Stop', long: 'Not workable', icon: 'pi pi-times-circle' },
};

export const activityLabels: Record<string, string> = {
  'scaffold-erection': 'Putting up or striking scaffold',
  'work-at-height': 'Work at height',
  mewp: 'Powered access platform',
  tower: 'Mobile tower',
  'roof-work': 'Roof work',
  'sheet-handling': 'Handling large sheets',
  bricklaying: 'Bricklaying',
  pointing: 'Pointing',
  rendering: 'Rendering',
  concrete: 'Concrete',
  groundworks: 'Groundworks',
};

const ruleFamilies: Record<string, string> = {
  wind: 'Wind',
  cold: 'Cold',
  heat: 'Heat',
  rain: 'Rain',
  day: 'Daylight',
  forecast: 'Forecast',
};

/** "wind.scaffold-use.balance" → "Wind: scaffold use, balance". */
export function ruleLabel(ruleId: string): string {
  const [family = '', ...rest] = ruleId.split('.');
  const head = ruleFamilies[family] ?? family.replaceAll('-', ' ');
  return rest.length ? `${head}: ${rest.map((part) => part.replaceAll('-', ' ')).join(', ')}` : head;
}

export function activityLabel(activity: string): string {
  return activityLabels[activity] ?? activity.replaceAll('-', ' ');
}

const rank: Record<Verdict, number> = { go: 0, caution: 1, stop: 2 };

export function worstVerdict(days: readonly DayWeatherDto[]): Verdict | null {
  return days.reduce<Verdict | null>((worst, day) => (worst === null || rank[day.verdict] > rank[worst] ? day.verdict : worst), null);
}

const key = (jobId: string, date: string) => `${jobId}|${date}`;

/** The forecast reaches about a fortnight ahead; the board and job pages read their verdicts from this window. */
const horizonDays = 14;

export const useWeatherStore = defineStore('weather', () => {
  const dayVerdicts = ref<Record<string, DayWeatherDto>>({});
  const outlook = shallowRef<WeatherOutlookDto | null>(null);
  const holds = ref<Record<string, WeatherHoldDto>>({});
  const isLoading = ref(false);
  const error = shallowRef<unknown>(null);
  let unbind: (() => void) | null = null;
  let reloadTimer: ReturnType<typeof setTimeout> | undefined;
  let loadSeq = 0;

  const verdictsByJob = computed(() => {
    const byJob = new Map<string, DayWeatherDto[]>();
    for (const day of Object.values(dayVerdicts.value)) byJob.set(day.jobId, [...(byJob.get(day.jobId) ?? []), day]);
    for (const list of byJob.values()) list.sort((a, b) => compareCodes(a.date, b.date));
    return byJob;
  });

  const openHolds = computed(() => Object.values(holds.value).filter((hold) => hold.status === 'open'));

  function verdictFor(jobId: string, date: string): DayWeatherDto | undefined {
    return dayVerdicts.value[key(jobId, date)];
  }

  /** The verdicts of these placed jobs' days from `from` to `to`: what a board showing them carries. */
  function verdictsWithin(assignments: Iterable<{ jobId: string; days: readonly string[] }>, from: string, to: string): DayWeatherDto[] {
    const list: DayWeatherDto[] = [];
    for (const assignment of assignments) {
      for (const date of assignment.days) {
        if (date < from || date > to) continue;
        const day = dayVerdicts.value[key(assignment.jobId, date)];
        if (day) list.push(day);
      }
    }
    return list;
  }

  function holdsForJob(jobId: string): WeatherHoldDto[] {
    return Object.values(holds.value)
      .filter((hold) => hold.jobId === jobId)
      .sort((a, b) => compareCodes(b.raisedAt, a.raisedAt));
  }

  async function loadVerdicts(): Promise<void> {
    const seq = ++loadSeq;
    isLoading.value = true;
    error.value = null;
    try {
      const wide = await weatherApi.getWeatherOutlook(horizonDays);
      if (seq !== loadSeq) return;
      dayVerdicts.value = Object.fromEntries(wide.days.map((day) => [key(day.jobId, day.date), day]));
      // The seven-day outlook is the first week of the same answer, so one request serves both.
      const to = addDays(wide.from, 6);
      outlook.value = { from: wide.from, to, days: wide.days.filter((d) => d.date <= to), atRisk: wide.atRisk.filter((d) => d.date <= to) };
    } catch (caught) {
      if (seq === loadSeq) error.value = caught;
    } finally {
      if (seq === loadSeq) isLoading.value = false;
    }
  }

  /** A moved job brings its own verdicts: the days it left lose theirs, the new days gain them. */
  function applyScheduleChange(change: Pick<ScheduleChangeDto, 'job' | 'weather'>): void {
    const jobId = change.job.id;
    const next = Object.fromEntries(Object.entries(dayVerdicts.value).filter(([, day]) => day.jobId !== jobId));
    for (const day of change.weather) next[key(day.jobId, day.date)] = day;
    dayVerdicts.value = next;
  }

  async function loadHolds(jobId?: string): Promise<WeatherHoldDto[]> {
    const list = await weatherApi.listWeatherHolds(jobId ? { jobId } : {});
    const next = { ...holds.value };
    if (jobId) for (const [id, hold] of Object.entries(next)) if (hold.jobId === jobId) delete next[id];
    for (const hold of list) next[hold.id] = hold;
    holds.value = next;
    return list;
  }

  async function raise(input: WeatherHoldInput): Promise<WeatherHoldDto> {
    const hold = await weatherApi.raiseWeatherHold(input);
    holds.value = { ...holds.value, [hold.id]: hold };
    return hold;
  }

  function preview(holdId: string, input: ReplanInput): Promise<ReplanPreviewDto> {
    return weatherApi.previewReplan(holdId, input);
  }

  async function withdraw(hold: WeatherHoldDto): Promise<WeatherHoldDto> {
    const withdrawn = await weatherApi.withdrawWeatherHold(hold.id, { version: hold.version });
    holds.value = { ...holds.value, [withdrawn.id]: withdrawn };
    return withdrawn;
  }

  async function commit(holdId: string, input: ReplanInput): Promise<ReplanPreviewDto> {
    const result = await weatherApi.commitReplan(holdId, input);
    const hold = holds.value[holdId];
    if (hold) holds.value = { ...holds.value, [holdId]: { ...hold, status: 'replanned', replanMode: input.mode, version: hold.version + 1 } };
    return result;
  }

  function scheduleReload(): void {
    clearTimeout(reloadTimer);
    // A refresh of every site arrives as a burst of pushes; one reload after it is enough.
    reloadTimer = setTimeout(() => void loadVerdicts(), 400);
  }

  function applyEvent(message: ResourceChangedMessage): void {
    // New forecasts or new firm limits both change the verdicts; the server works them out again on read.
    if (message.type === 'forecast:updated' || message.type === 'weather-limits:updated') scheduleReload();
    if (message.type.startsWith('hold:')) {
      const jobIds = new Set(Object.values(holds.value).map((hold) => hold.jobId));
      for (const jobId of jobIds) void loadHolds(jobId).catch(() => undefined);
      if (jobIds.size === 0 && message.type === 'hold:raised') void loadHolds().catch(() => undefined);
    }
  }

  function bindRealtime(client: RealtimeClient): void {
    if (unbind) return;
    client.start();
    const stops = [
      client.onResourceChanged((message) => applyEvent(message)),
      client.onScheduleChanged((message) => applyScheduleChange(message.change)),
    ];
    unbind = () => stops.forEach((stop) => stop());
  }

  function clear(): void {
    loadSeq += 1;
    dayVerdicts.value = {};
    outlook.value = null;
    holds.value = {};
  }

  return {
    dayVerdicts,
    outlook,
    holds,
    openHolds,
    isLoading,
    error,
    verdictsByJob,
    verdictFor,
    verdictsWithin,
    holdsForJob,
    loadVerdicts,
    applyScheduleChange,
    loadHolds,
    raise,
    preview,
    commit,
    withdraw,
    applyEvent,
    bindRealtime,
    clear,
  };
});

function addDays(date: string, days: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}
