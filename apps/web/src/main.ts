import './boot/renew-session';
import { createApp } from 'vue';
import { createPinia } from 'pinia';
import App from './App.vue';
import { createAppRouter } from './router';
import { installPrimeVue, darkModeClass } from './plugins/primevue';
// Imported from here rather than from main.css, so the build can cut it down to the icons the app uses
// (vite/primeicons-subset.ts): an @import inside a stylesheet does not pass through the build's plugins.
import 'primeicons/primeicons.css';
import './styles/main.css';
// PrimeVue's theme, built from plugins/primevue-preset.ts by vite/primevue-theme.ts; after our own styles, where
// PrimeVue's run-time style elements used to land.
import 'virtual:primevue-theme.css';

if (localStorage.getItem('hodboard:theme') === 'dark') document.documentElement.classList.add(darkModeClass);

const app = createApp(App);
app.use(createPinia());
installPrimeVue(app);
app.use(createAppRouter());
app.mount('#app');
