import { describe, expect, it } from 'vitest';
import type { InspectionStatusDto } from '@hodboard/shared';
import { crewInspectionText } from './inspection-text';

const status = (overrides: Partial<InspectionStatusDto>): InspectionStatusDto => ({
  status: 'none', nextDue: null, lastInspectedOn: null, reasons: [], source: null, adverseDays: [], ...overrides,
});

describe('crewInspectionText', () => {
  it.each([
    ['due after going up', status({ status: 'due', nextDue: '2027-02-26', reasons: ['after-assembly'] }), 'Inspection due today before anyone goes up'],
    ['due after the wind', status({ status: 'due', nextDue: '2027-06-16', reasons: ['after-adverse-weather'] }), 'Inspection due today after the wind, before anyone goes up'],
    ['overdue', status({ status: 'overdue', nextDue: '2027-06-16', lastInspectedOn: '2027-06-11', reasons: ['within-7-days'] }), 'Inspection overdue since Wed 16 Jun: nobody goes up until it is inspected'],
    ['overdue after the wind', status({ status: 'overdue', nextDue: '2027-06-16', reasons: ['after-adverse-weather'] }), 'Inspection overdue since Wed 16 Jun (after the wind): nobody goes up until it is inspected'],
    ['in date', status({ status: 'ok', nextDue: '2027-03-05', lastInspectedOn: '2027-02-26', reasons: ['within-7-days'] }), 'Inspected Fri 26 Feb; next due Fri 5 Mar'],
    ['found unsafe', status({ status: 'unsafe', nextDue: '2027-03-02', lastInspectedOn: '2027-03-02' }), 'Last inspection found it unsafe: keep off'],
    ['not up', status({}), 'Not up yet'],
  ])('says what a scaffold %s means for going up', (_name, inspection, text) => {
    expect(crewInspectionText(inspection)).toBe(text);
  });
});
