import './boot/renew-session';
import { createApp } from 'vue';
import { createPinia } from 'pinia';
import App from './App.vue';
import { createAppRouter } from './router';
import { installPrimeVue, darkModeClass } from './plugins/primevue';
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
