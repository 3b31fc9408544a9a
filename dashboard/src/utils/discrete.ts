import { createDiscreteApi } from 'naive-ui'
import { themeOverrides } from '../theme'

/**
 * naive-ui's message and loading bar for code that runs outside a component's setup()
 * (router guards, the API client, the global error handler).
 */
export const { message, loadingBar } = createDiscreteApi(['message', 'loadingBar'], {
  configProviderProps: { themeOverrides },
})
