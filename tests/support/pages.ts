// The main pages every browser-wide check walks (content security policy, accessibility), and the languages
// to walk them in. A page in another language is the same path with the person's language set first.
export const MAIN_PAGES = ['/', '/scan', '/bay', '/swap', '/charge', '/check', '/cage', '/refill', '/exchange', '/requalify', '/emissions', '/co',
  '/trucks', '/batteries', '/batteries/new', '/cylinders', '/labels', '/people', '/site', '/mail',
  '/due', '/schedules', '/logs', '/logs/truck-checklists', '/inspect', '/incidents', '/ventilation', '/reports', '/reports/energy', '/calendar', '/account'] as const

export const LANGUAGES = ['en', 'es'] as const
export type Language = typeof LANGUAGES[number]
