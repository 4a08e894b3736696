import { readFileSync, readdirSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'

// Words a person reads come from the locale files: no component's template holds an English sentence of its own
// (the list pager's "Previous · Page 1 of 3 · Next" and the asset pages' "New battery" once did, in every
// language). Left as written: the product's name, units and the names of standards.
const app = fileURLToPath(new URL('../../app', import.meta.url))
const vue = readdirSync(app, { recursive: true, encoding: 'utf8' }).filter(f => f.endsWith('.vue'))
const KEPT = /Bayward|CSV|ppm|ft³\/min|m³\/h|H₂|Ah|EN 62485-3/g

function template(file: string): string {
  const text = readFileSync(join(app, file), 'utf8')
  const start = text.indexOf('<template>')
  return start < 0 ? '' : text.slice(start + '<template>'.length, text.lastIndexOf('</template>'))
}

describe('templates', () => {
  it('hold no words of their own between tags, only {{ }} from the locale files', () => {
    const found = vue.flatMap((file) => {
      const bare = template(file).replace(/<!--[\s\S]*?-->/g, '').replace(/\{\{[\s\S]*?\}\}/g, ' ').replace(/=>/g, '').replace(/"[^"]*"/g, '""')
      return [...bare.matchAll(/>([^<>]*)</g)].map(m => m[1]!.trim()).filter(w => /\p{L}{2,}/u.test(w.replace(KEPT, ' '))).map(w => `${file}: ${w}`)
    })
    expect(found).toEqual([])
  })

  it('give no fixed words to aria-label, title, alt or placeholder', () => {
    const found = vue.flatMap(file => [...template(file).matchAll(/\s(aria-label|title|alt|placeholder)="([^"]*)"/g)]
      .filter(m => /[a-z]{3,} [a-z]/i.test(m[2]!) || /^[A-Z][a-z]{2,}$/.test(m[2]!)).map(m => `${file}: ${m[1]}="${m[2]}"`))
    expect(found).toEqual([])
  })
})
