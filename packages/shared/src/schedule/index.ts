export * from './conflicts.js';
export * from './time-off-rule.js';
export * from './job-activities.js';
export * from './replan.js';
export * from './changes.js';
export * from './board-lists.js';
