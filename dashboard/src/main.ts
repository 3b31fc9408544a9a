import '@fontsource/public-sans/400.css'
import '@fontsource/public-sans/600.css'
import '@fontsource/public-sans/700.css'
import './styles.css'
import { createPinia } from 'pinia'
import { createApp } from 'vue'
import App from './App.vue'
import { router } from './router'
import { cssVariables } from './theme'
import { naiveA11y } from './utils/a11y'
import { message } from './utils/discrete'

for (const [k, v] of Object.entries(cssVariables())) document.documentElement.style.setProperty(k, v)

const app = createApp(App)
app.use(createPinia())
app.use(router)
app.use(naiveA11y)
// Last resort: anything a component did not handle reaches the user as a toast, not silence.
app.config.errorHandler = err => {
  console.error(err)
  message.error(err instanceof Error ? err.message : 'Something went wrong.')
}
app.mount('#app')
