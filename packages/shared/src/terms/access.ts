/** Access kinds in the trade's own words. */
export const accessTypes = ['scaffold', 'tower', 'mewp', 'roof-ladder', 'edge-protection'] as const;
export type AccessType = (typeof accessTypes)[number];
export const accessTypeLabels: Record<AccessType, string> = {
  scaffold: 'Scaffold',
  tower: 'Mobile tower',
  mewp: 'MEWP',
  'roof-ladder': 'Roof ladder',
  'edge-protection': 'Edge protection',
};

/** Where an access booking has got to, from the request to the supplier to the strike. */
export const accessStates = ['requested', 'confirmed', 'erected', 'struck', 'cancelled'] as const;
export type AccessState = (typeof accessStates)[number];
export const accessStateLabels: Record<AccessState, string> = {
  requested: 'Requested',
  confirmed: 'Confirmed',
  erected: 'Up',
  struck: 'Struck',
  cancelled: 'Cancelled',
};

/** Why Hodboard itself cancelled a booking: every job it served left the board or was cancelled. */
export const accessCancelReasons = ['job-unscheduled', 'job-cancelled'] as const;
export type AccessCancelReason = (typeof accessCancelReasons)[number];

export const ACCESS_SAFETY_NOTE =
  'Scaffolds are erected, altered, inspected and struck only by competent, trained people. Inspection duties and intervals differ between countries: follow your local regulations and the scaffold supplier.';
