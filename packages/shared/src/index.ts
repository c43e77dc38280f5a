export * from './terms/index.js';
export * from './schemas/index.js';
export * from './rules/index.js';
export * from './schedule/index.js';
