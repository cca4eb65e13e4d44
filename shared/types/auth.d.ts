declare module '#auth-utils' {
  interface User {
    id: string
    name: string
    email: string
  }
  // Never sent to the browser: the key of the session's row in the `sessions` table.
  interface SecureSessionData {
    token: string
  }
}

export {}
