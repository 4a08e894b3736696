import { readFileSync, readdirSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { LANGUAGES } from '../../shared/utils/languages'

// Every language has every key, keys are snake_case and sorted, and {placeholders} agree between languages.
const dir = new URL('../../i18n/locales/', import.meta.url)
const leadDir = new URL('../../i18n/lead/', import.meta.url)
// a language's words: its locale file, with the lead pages' words where they are a file of their own (English),
// merged in key order
function read(name: string): Record<string, unknown> {
  const words = JSON.parse(readFileSync(new URL(`${name}.json`, dir), 'utf8')) as Record<string, unknown>
  const leadFile = readdirSync(leadDir).includes(`${name}.json`) ? JSON.parse(readFileSync(new URL(`${name}.json`, leadDir), 'utf8')) as Record<string, unknown> : {}
  const overlap = Object.keys(leadFile).filter(k => k in words)
  if (overlap.length) throw new Error(`${name}: ${overlap.join(', ')} in both the locale file and the lead file`)
  const merged = { ...words, ...leadFile }
  return Object.fromEntries(Object.keys(merged).sort().map(k => [k, merged[k]]))
}

function flat(tree: Record<string, unknown>, prefix = ''): Record<string, string> {
  const out: Record<string, string> = {}
  for (const [key, value] of Object.entries(tree)) {
    if (value && typeof value === 'object') Object.assign(out, flat(value as Record<string, unknown>, `${prefix}${key}.`))
    else out[`${prefix}${key}`] = String(value)
  }
  return out
}
const keysInOrder = (tree: Record<string, unknown>): string[][] => [Object.keys(tree), ...Object.values(tree).filter(v => v && typeof v === 'object').flatMap(v => keysInOrder(v as Record<string, unknown>))]
const placeholders = (text: string) => [...text.matchAll(/\{(\w+)\}/g)].map(m => m[1]).sort()

describe('translations', () => {
  const files = Object.fromEntries(LANGUAGES.map(l => [l, flat(read(l))]))

  it('has one file per language and no other', () => {
    expect(readdirSync(dir).filter(f => f.endsWith('.json')).sort()).toEqual(LANGUAGES.map(l => `${l}.json`).sort())
  })

  it.each(LANGUAGES)('%s has every key the others have, with words', (language) => {
    const all = new Set(Object.values(files).flatMap(f => Object.keys(f)))
    const missing = [...all].filter(key => !(key in files[language]!))
    expect(missing).toEqual([])
    expect(Object.entries(files[language]!).filter(([, v]) => !v.trim()).map(([k]) => k)).toEqual([])
  })

  it.each(LANGUAGES)('%s keys are snake_case and sorted', (language) => {
    for (const keys of keysInOrder(read(language))) {
      expect(keys).toEqual([...keys].sort())
      for (const key of keys) expect(key).toMatch(/^[a-z0-9]+(_[a-z0-9]+)*$/)
    }
  })

  it('each message takes the same {placeholders} in every language', () => {
    const english = files.en!
    for (const language of LANGUAGES) {
      for (const [key, text] of Object.entries(files[language]!)) expect([key, placeholders(text)]).toEqual([key, placeholders(english[key] ?? '')])
    }
  })
})
