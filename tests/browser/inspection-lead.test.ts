import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import type { Browser } from 'playwright-core'
import { and, asc, eq } from 'drizzle-orm'
import { builtServer, signIn } from '../support/http'
import { battery, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { PHONE, launchChromium, signInAt } from '../support/chromium'
import { fittedTruck } from '../support/battery-room'
import { answers, classQualification, inspect } from '../support/inspection'
import { DEFAULT_INSPECTION_ITEMS, DEFAULT_INSPECTION_TITLES } from '../../shared/utils/truck-inspection'

await setup(builtServer)

let browser: Browser
let siteId: string
const people: Record<string, { id: string, email: string, password: string, name: string }> = {}

// Invented site: an operator on class 1 with one check recorded, and a safety lead who keeps the checklists.
beforeAll(async () => {
  browser = await launchChromium()
  siteId = (await site({ name: `Larkspur Yard ${Date.now().toString(36)}` })).id
  people.operator = await user({ siteId, roles: ['operator'], name: `Ines Operator ${Date.now().toString(36)}` })
  await classQualification(people.operator.id, 1)
  people.lead = await user({ siteId, roles: ['safety_lead'] })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('a lead keeps the pre-shift checklists and calls for retraining, at phone width', () => {
  it('edits the electric checklist: a new version is saved and a check recorded before keeps its version', async () => {
    const t = await fittedTruck(siteId, { fleetNumber: 'LY-03' })
    const op = await signIn(people.operator!)
    const recorded = await inspect(op, t.id, { answers: answers('electric') })
    expect(recorded.status).toBe(201)

    const { page } = await signInAt(browser, people.lead!, '/logs/truck-checklists', PHONE)
    const form = page.getByRole('form', { name: DEFAULT_INSPECTION_TITLES.electric })
    await expect.poll(() => form.getByText('version 1').isVisible()).toBe(true)
    await form.getByLabel('Item 1 wording').first().fill('Horn, lights and travel alarm all work')
    await form.getByRole('button', { name: 'Add an item here' }).first().click()
    // the new item comes last in the key-off group, whose items come first
    const n = DEFAULT_INSPECTION_ITEMS.electric.filter(i => i.group === 'key_off').length + 1
    const added = form.getByRole('listitem').filter({ has: page.getByLabel(`Item ${n} wording`) }).first()
    await added.getByLabel(`Item ${n} wording`).fill('Floor under the truck dry: no fresh drips')
    await added.getByRole('checkbox').check()
    await form.getByRole('button', { name: 'Save as version 2' }).click()
    await expect.poll(() => page.getByText('Saved as version 2').isVisible()).toBe(true)
    await page.context().close()

    const t2 = tables.truckInspectionTemplates
    const versions = await useTestDb().select().from(t2).where(and(eq(t2.siteId, siteId), eq(t2.power, 'electric'))).orderBy(asc(t2.version))
    expect(versions.map(v => [v.version, v.active])).toEqual([[1, false], [2, true]])
    expect(versions[1]!.items).toContainEqual(expect.objectContaining({ label: 'Floor under the truck dry: no fresh drips', critical: true, group: 'key_off' }))
    const [old] = await useTestDb().select().from(tables.truckInspections).where(eq(tables.truckInspections.id, recorded.body.item.id))
    expect(old!.templateId).toBe(versions[0]!.id)
  })

  it('the due list names the trucks used today and not checked this shift by fleet number, each one tap from its check', async () => {
    const used = await fittedTruck(siteId, { fleetNumber: 'LY-07' })
    const b = await battery({ siteId })
    // changed a second ago, so used today on any clock; nobody has checked it since the shift began
    await useTestDb().insert(tables.batterySwaps).values({ siteId, userId: people.operator!.id, at: new Date(Date.now() - 1000), truckId: used.id, batteryInId: b.id, hourMeter: null })
    const { page } = await signInAt(browser, people.lead!, '/due', PHONE)
    const card = page.getByRole('region', { name: 'Pre-shift checks' })
    await expect.poll(() => card.getByText('Tap a truck to check it.').isVisible()).toBe(true)
    const link = card.getByRole('link', { name: 'Check LY-07' })
    expect(await link.innerText()).toBe('LY-07')
    await link.click()
    await page.waitForURL(new RegExp(`/inspect\\?truck=${used.id}`))
    await page.context().close()
  })

  it('a safety lead records a near miss for an operator, not for themself', async () => {
    const { page } = await signInAt(browser, people.lead!, '/people', PHONE)
    const card = page.getByRole('listitem').filter({ hasText: people.operator!.email })
    await card.getByRole('button', { name: 'record retraining' }).click()
    await card.getByLabel('What happened').selectOption('near_miss')
    await card.getByLabel('Note').fill('Clipped a rack upright reversing')
    await card.getByRole('button', { name: 'Record retraining' }).click()
    await expect.poll(() => page.getByText('evaluation is now due').isVisible()).toBe(true)
    const mine = page.getByRole('listitem').filter({ hasText: people.lead!.email })
    expect(await mine.getByRole('button', { name: 'record retraining' }).count()).toBe(0)
    await page.context().close()
    const rows = await useTestDb().select().from(tables.retrainingTriggers).where(eq(tables.retrainingTriggers.personId, people.operator!.id))
    expect(rows).toMatchObject([{ reason: 'near_miss', note: 'Clipped a rack upright reversing', userId: people.lead!.id }])
  })
})
