// Imported on its own by the page's first script, so Vue, Pinia and the router run in a task of their own before the
// app's code (see start.ts). Named re-exports, not the whole packages, so the build still leaves out what is unused.
export { createApp } from 'vue';
export { createPinia } from 'pinia';
export { createRouter } from 'vue-router';
