import { readFileSync, readdirSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import { ABILITIES, ABILITY_NAMES, can, refusalFor, roleNames, rolesWith, whoHolds } from '../../shared/utils/abilities'
import { ROLES } from '../../shared/types/auth'

const root = fileURLToPath(new URL('../..', import.meta.url))
function files(dir: string): string[] {
  return readdirSync(join(root, dir)).flatMap((name) => {
    const full = join(root, dir, name)
    if (statSync(full).isDirectory()) return name === 'migrations' ? [] : files(relative(root, full))
    return /\.(ts|vue|mjs)$/.test(name) ? [relative(root, full)] : []
  })
}

describe('the permissions map', () => {
  it('names only real roles, and every site ability is held by someone', () => {
    for (const [name, rule] of Object.entries(ABILITIES)) {
      for (const role of rule.roles) expect(ROLES, name).toContain(role)
      expect(rule.roles.length, name).toBeGreaterThan(0)
      expect(rule.does, name).toMatch(/^[a-z]/)
    }
  })

  it('answers for roles, and public and signed-in abilities hold for anyone', () => {
    expect(can(['operator'], 'swap.record')).toBe(true)
    expect(can(['operator'], 'swap.override')).toBe(false)
    expect(can(['operator', 'technician'], 'swap.override')).toBe(true)
    expect(can([], 'site.member')).toBe(false)
    expect(can([], 'auth.sign-in')).toBe(true)
    expect(can([], 'account.self')).toBe(true)
    expect(can(['facilities_lead'], 'log.sign')).toBe(false)
    expect(rolesWith('log.sign')).toEqual(['safety_lead'])
  })

  it('refuses in plain words that name the roles', () => {
    expect(roleNames(['technician', 'facilities_lead', 'admin'])).toBe('Technician, Facilities lead or Admin')
    expect(refusalFor('emissions.record')).toBe('To record emissions tests you need one of these roles at this site: Facilities lead or Admin.')
  })

  // Role lists live in the map and nowhere else: a line naming two or more roles outside it is a list
  // that would drift from the map (the role enum and its labels are the other exception).
  it('no other file in app/, server/ or shared/ types a role list', () => {
    const allowed = new Set(['shared/types/auth.ts', 'shared/utils/abilities.ts'])
    const role = new RegExp(`['"\`](${ROLES.join('|')})['"\`]`, 'g')
    const offenders: string[] = []
    for (const file of [...files('app'), ...files('server'), ...files('shared')]) {
      if (allowed.has(file)) continue
      readFileSync(join(root, file), 'utf8').split('\n').forEach((line, i) => {
        if (new Set([...line.matchAll(role)].map(m => m[1])).size >= 2) offenders.push(`${file}:${i + 1}: ${line.trim()}`)
      })
    }
    expect(offenders).toEqual([])
  })

  it('README\'s security section lists every ability with the roles the map gives it', () => {
    const readme = readFileSync(join(root, 'README.md'), 'utf8')
    const rows = new Map([...readme.matchAll(/^\| `([a-z.-]+)` \| ([^|]+) \|/gm)].map(m => [m[1]!, m[2]!.trim()]))
    for (const name of ABILITY_NAMES) {
      expect(rows.get(name), name).toBe(whoHolds(name))
    }
    expect([...rows.keys()].filter(k => !(ABILITY_NAMES as string[]).includes(k))).toEqual([])
  })
})
