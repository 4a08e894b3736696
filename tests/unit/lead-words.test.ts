import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { INCIDENT_CAUTIONS, INCIDENT_KIND_LABELS } from '../../shared/utils/incidents'
import { QUALIFICATION_LABELS } from '../../shared/utils/admin-schemas'
import { INSPECTION_GROUP_LABELS, RETRAINING_REASON_LABELS } from '../../shared/utils/truck-inspection'
import { CHARGER_TYPE_LABELS, CHEMISTRY_LABELS, CYLINDER_SPEC_LABELS, POWER_LABELS, AREA_KIND_LABELS, TRUCK_CLASS_LABELS } from '../../shared/utils/asset-schemas'
import { CHECK_RESULT_LABELS } from '../../shared/utils/area-checklists'
import { CUSTOM_SUBJECT_LABELS, CUSTOM_UNIT_LABELS, SCHEDULE_GROUP_LABELS } from '../../shared/utils/schedule-words'
import { defaultSchedules } from '../../shared/utils/due-schedules'
import { LABEL_LAYOUTS, PAPER_POINTS } from '../../shared/utils/label-layouts'
import enFloor from '../../i18n/locales/en.json'
import enLead from '../../i18n/lead/en.json'

// The lead pages read their words from the locale files; the English there is the English of the shared
// label maps and of app/utils/asset-views.ts, word for word, so a label changed in one place is changed in both.
type Tree = { [key: string]: string | Tree }
const en = { ...enFloor, ...enLead }
const at = (key: string) => key.split('.').reduce<string | Tree | undefined>((node, part) => (typeof node === 'object' ? node[part] : undefined), en as Tree)
const same = (prefix: string, labels: Readonly<Record<string | number, string>>) =>
  expect(Object.fromEntries(Object.keys(labels).map(k => [k, at(`${prefix}${k}`)]))).toEqual({ ...labels })

describe('lead words in English match the shared labels', () => {
  it('incidents, training and checklists', () => {
    same('incident.kind.', INCIDENT_KIND_LABELS)
    for (const [kind, cautions] of Object.entries(INCIDENT_CAUTIONS)) expect(cautions.map((_, n) => at(`incident.caution.${kind}_${n + 1}`))).toEqual(cautions)
    same('people.qualification.', QUALIFICATION_LABELS)
    same('people.retraining_reason.', RETRAINING_REASON_LABELS)
    same('inspect.group.', INSPECTION_GROUP_LABELS)
    same('logs.result.', CHECK_RESULT_LABELS)
    same('logs.area_kind.', AREA_KIND_LABELS)
  })

  it('schedules', () => {
    same('schedules.unit.', CUSTOM_UNIT_LABELS)
    same('schedules.subject.', CUSTOM_SUBJECT_LABELS)
    same('schedules.group.', SCHEDULE_GROUP_LABELS)
    for (const s of defaultSchedules()) expect([s.kind, at(`due.kind.${s.kind}`), at(`schedules.applies_to.${s.kind}`), at(`schedules.source.${s.kind}`)]).toEqual([s.kind, s.title, s.appliesTo, s.source])
  })

  it('assets and labels', () => {
    same('asset_list.option.power.', POWER_LABELS)
    same('asset_list.option.chemistry.', CHEMISTRY_LABELS)
    same('asset_list.option.charger_type.', CHARGER_TYPE_LABELS)
    same('asset_list.option.cylinder_spec.', CYLINDER_SPEC_LABELS)
    same('asset_list.option.area_kind.', AREA_KIND_LABELS)
    same('asset_list.option.truck_class.', TRUCK_CLASS_LABELS)
    same('labels.layout_', Object.fromEntries(Object.entries(LABEL_LAYOUTS).map(([k, l]) => [k, l.label])))
    same('labels.paper_', Object.fromEntries(Object.entries(PAPER_POINTS).map(([k, p]) => [k, p.label])))
  })

  it('every column, filter and field of the asset views', () => {
    const src = readFileSync(new URL('../../app/utils/asset-views.ts', import.meta.url), 'utf8').replace(/\\'/g, '\u2019')
    const plain = (text: string | undefined) => text?.replace(/\u2019/g, '\'')
    const snake = (k: string) => k.replace(/[A-Z]/g, c => `_${c.toLowerCase()}`)
    const parts = src.split(/\n {2}(truck|battery|charger|cylinder|area): \{/).slice(1)
    let checked = 0
    for (let i = 0; i < parts.length; i += 2) {
      const kind = parts[i]!
      const body = parts[i + 1]!.split(/\n {2}\},?\n/)[0]!
      const section = (name: string) => new RegExp(`${name}: \\[(.*)\\],|${name}: \\[([\\s\\S]*?)\\n {4}\\],`).exec(body)!.slice(1).join('')
      for (const m of section('columns').matchAll(/\{ key: '(\w+)', label: '([^']*)'/g)) expect(at(`asset_list.${kind}.col.${snake(m[1]!)}`)).toBe(plain(m[2]))
      for (const m of section('filters').matchAll(/\{ key: '(\w+)', label: '([^']*)'/g)) expect(at(`asset_list.${kind}.filter.${snake(m[1]!)}`)).toBe(plain(m[2]))
      for (const line of section('fields').split('\n')) {
        const m = /\{ key: '(\w+)', label: '([^']*)'/.exec(line)
        if (!m) continue
        expect(at(`asset_form.${kind}.${snake(m[1]!)}`)).toBe(plain(m[2]))
        const hint = /hint: '([^']*)'/.exec(line)
        if (hint) expect(at(`asset_form.${kind}.${snake(m[1]!)}_hint`)).toBe(plain(hint[1]))
        checked++
      }
    }
    expect(checked).toBeGreaterThan(50)
  })

  it('every site setting', () => {
    const src = readFileSync(new URL('../../app/utils/site-setting-views.ts', import.meta.url), 'utf8')
    const found = [...src.matchAll(/\{ key: '(\w+)', label: '([^']*)', source: '((?:[^'\\]|\\')*)'/g)]
    expect(found.length).toBeGreaterThan(10)
    for (const [, key, label, source] of found) {
      const snake = key!.replace(/[A-Z]/g, c => `_${c.toLowerCase()}`)
      expect([at(`site.setting.${snake}`), at(`site.setting_source.${snake}`)]).toEqual([label, source!.replace(/\\'/g, '\'')])
    }
  })
})
