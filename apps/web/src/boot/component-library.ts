// Imported on its own by the page's first script, so PrimeVue's core runs in a task of its own (see start.ts).
export { default as PrimeVue } from 'primevue/config';
