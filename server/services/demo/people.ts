import type { Role } from '#shared/auth/roles'
import demo from './people.json'

/** The invented newsroom and its invented people; `npm start` prints them, the README lists them. */
export const DEMO_NEWSROOM: string = demo.newsroom
export const DEMO_PASSWORD: string = demo.password
export const DEMO_PEOPLE = demo.people as { name: string, email: string, role: Role }[]
