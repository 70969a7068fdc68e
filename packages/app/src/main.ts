import { createApp } from 'vue';
import { createPinia } from 'pinia';
import '@fontsource/roboto/latin-400.css';
import '@fontsource/roboto/latin-500.css';
import './styles/theme.css';
import App from './App.vue';
import { createAppRouter } from './router/index.ts';

// Browser tests take screenshots: without motion they never catch a half-finished transition.
if (navigator.webdriver) document.documentElement.classList.add('lw-no-motion');

const pinia = createPinia();
const app = createApp(App);
app.use(pinia);
app.use(createAppRouter(pinia));
app.mount('#app');
