import { readFileSync, readdirSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import en from '../../i18n/locales/en.json'
import es from '../../i18n/locales/es.json'

// The confirmations at the bottom of the screen ("Battery changed.", "On charge.", "It ran hot: let it cool")
// are read in the person's language: every toast is given words from the locale files, never a sentence
// written in the code.
const app = fileURLToPath(new URL('../../app', import.meta.url))
const files = readdirSync(app, { recursive: true, encoding: 'utf8' })
  .filter(f => /\.(ts|vue)$/.test(f))
  .map(f => ({ file: f, text: readFileSync(join(app, f), 'utf8') }))

describe('toasts', () => {
  it('no toast is handed a sentence written in the code', () => {
    const literal = /\b(?:show|done)\(\s*(?:[^,()]+,\s*)?(?:['"`]|[^,()]*\?\s*['"`][A-Z])/
    const found = files.flatMap(({ file, text }) => text.split('\n')
      .map((line, i) => ({ where: `${file}:${i + 1}`, line: line.trim() }))
      .filter(({ line }) => literal.test(line) && !/refreshNuxtData|\bt\(|i18n\.t\(|WORDS/.test(line)))
    expect(found).toEqual([])
  })

  it('every toast key the code names is in both languages', () => {
    const named = new Set(files.flatMap(({ text }) => [...text.matchAll(/'toast\.([a-z_]+(?:\.[a-z_]+)?)/g)].map(m => m[1]!)))
    expect(named.size).toBeGreaterThan(30)
    const words = (tree: Record<string, unknown>, key: string) => key.split('.').reduce<unknown>((t, k) => (t as Record<string, unknown> | undefined)?.[k], tree)
    for (const key of named) {
      // `toast.added.${kind}`: every asset kind's words
      if (key === 'added') continue
      expect([key, typeof words(en.toast, key)]).toEqual([key, 'string'])
      expect([key, typeof words(es.toast, key)]).toEqual([key, 'string'])
    }
    for (const kind of ['area', 'battery', 'charger', 'cylinder', 'truck']) expect(typeof words(es.toast.added, kind)).toBe('string')
  })
})
