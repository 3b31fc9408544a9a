import type { User as AppUser } from '@shared/schemas/auth'

declare global {
  namespace Express {
    // passport puts the signed-in user here
    interface User extends AppUser {}
  }
}

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string
  }
}

export {}
