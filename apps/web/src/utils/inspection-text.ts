import { format, parseISO } from 'date-fns';
import type { InspectionStatusDto } from '@hodboard/shared';

const short = (date: string | null) => (date ? format(parseISO(date), 'EEE d MMM') : '');

/** What a crew lead's phone says about the scaffold they are about to use: whether anyone may go up today. */
export function crewInspectionText(inspection: InspectionStatusDto): string {
  const afterWind = inspection.reasons.includes('after-adverse-weather') ? ' (after the wind)' : '';
  switch (inspection.status) {
    case 'ok':
      return `Inspected ${short(inspection.lastInspectedOn)}; next due ${short(inspection.nextDue)}${afterWind}`;
    case 'due':
      return afterWind ? 'Inspection due today after the wind, before anyone goes up' : 'Inspection due today before anyone goes up';
    case 'overdue':
      return `Inspection overdue since ${short(inspection.nextDue)}${afterWind}: nobody goes up until it is inspected`;
    case 'unsafe':
      return 'Last inspection found it unsafe: keep off';
    default:
      return 'Not up yet';
  }
}
