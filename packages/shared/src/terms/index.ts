// The words both apps show and check against, without the validation that needs zod: a screen that only shows
// them (the crew's phone, for one) then loads no schema code at all.
export * from './errors.js';
export * from './roles.js';
export * from './access.js';
export * from './weather.js';
