import { createApp } from 'vue';
import { createPinia } from 'pinia';
import '@fontsource/roboto/latin-400.css';
import '@fontsource/roboto/latin-500.css';
import './styles/theme.css';
import App from './App.vue';
import { createAppRouter } from './router/index.ts';
import { analysisWorker } from './workers/dspClient.ts';

// Browser tests take screenshots: without motion they never catch a half-finished transition.
if (navigator.webdriver) document.documentElement.classList.add('lw-no-motion');

const pinia = createPinia();
const app = createApp(App);
app.use(pinia);
app.use(createAppRouter(pinia));
app.mount('#app');
// The analysis worker loads and warms up (workers/jobServer.ts) while the page signs in and fetches
// the design, instead of after the design's first analysis was asked for.
analysisWorker().start();
