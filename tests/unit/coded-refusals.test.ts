import { readFileSync, readdirSync } from 'node:fs'
import { join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'

// A refusal (4xx) a screen shows is said in the reader's language from its code (refusal.<code> in
// i18n/locales), so every 4xx createError in the server carries a code (data.code, or coded reasons);
// codedError(status, code, …) does. Only these are left in English, each for the reason beside it.
const UNCODED = [
  // a request from another site: the app's own pages never send one
  ['server/middleware/01.security.ts', 'Requests from other sites are refused.'],
  // a calendar feed's address is read by a calendar program, not by a screen
  ['server/routes/calendar/[token].ics.ts', 'No such calendar.'],
]

const root = fileURLToPath(new URL('../../', import.meta.url))

function sources(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap(entry => entry.isDirectory()
    ? sources(join(dir, entry.name))
    : entry.name.endsWith('.ts') ? [join(dir, entry.name)] : [])
}

// The argument text of each createError( … ) call, up to its closing parenthesis.
function createErrorCalls(text: string): string[] {
  const calls: string[] = []
  for (let at = text.indexOf('createError('); at !== -1; at = text.indexOf('createError(', at + 1)) {
    let depth = 0
    for (let i = at + 'createError'.length; i < text.length; i++) {
      if (text[i] === '(') depth++
      else if (text[i] === ')' && --depth === 0) {
        calls.push(text.slice(at, i + 1))
        break
      }
    }
  }
  return calls
}

const files = sources(join(root, 'server')).map(path => ({ path: relative(root, path), text: readFileSync(path, 'utf8') }))

describe('coded refusals', () => {
  it('finds the server\'s createError calls', () => {
    expect(files.length).toBeGreaterThan(50)
    expect(files.flatMap(f => createErrorCalls(f.text)).length).toBeGreaterThan(5)
  })

  it('gives every 4xx createError a code, but for the few listed', () => {
    const uncoded = files.flatMap(f => createErrorCalls(f.text)
      .filter(call => /statusCode:\s*4\d\d/.test(call) && !/\bcode\b|\breasons\b/.test(call))
      .filter(call => !UNCODED.some(([path, message]) => path === f.path && call.includes(message!)))
      .map(call => `${f.path}: ${call}`))
    expect(uncoded).toEqual([])
  })

  it('keeps the list of uncoded refusals true', () => {
    for (const [path, message] of UNCODED) {
      const file = files.find(f => f.path === path)
      expect(file && createErrorCalls(file.text).some(call => call.includes(message!)), `${path}: ${message}`).toBe(true)
    }
  })

  it('has words for every code a codedError names', () => {
    const refusal = (JSON.parse(readFileSync(join(root, 'i18n/locales/en.json'), 'utf8')) as { refusal: Record<string, string> }).refusal
    const codes = new Set(files.flatMap(f => [...f.text.matchAll(/codedError\(\s*\d{3},\s*'([a-z_]+)'/g)].map(m => m[1]!)))
    expect(codes.size).toBeGreaterThan(30)
    expect([...codes].filter(code => !(code in refusal))).toEqual([])
  })
})
