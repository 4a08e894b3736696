import { beforeEach, describe, expect, it } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import { useSessionStore } from '../../app/stores/session'
import ScanCodeForm from '../../app/components/scan/ScanCodeForm.vue'

const me = {
  user: { id: 'u1', email: 'tech@example.test', name: 'Tess Tech' },
  memberships: [
    { siteId: 's-home', siteName: 'Zeta Yard', roles: ['technician' as const] },
    { siteId: 's-away', siteName: 'Alpha Dock', roles: ['technician' as const, 'safety_lead' as const] },
  ],
  sites: [
    { id: 's-away', name: 'Alpha Dock', timeZone: 'America/Chicago', unitSystem: 'metric' as const },
    { id: 's-home', name: 'Zeta Yard', timeZone: 'America/Chicago', unitSystem: 'us' as const },
  ],
}

describe('session store', () => {
  beforeEach(() => {
    setActivePinia(createPinia())
    useCookie('bayward-site').value = null
  })

  it('opens on the site the user joined first, not the first by name, and lists sites by name', () => {
    const session = useSessionStore()
    session.me = me
    expect(session.sites.map(s => s.name)).toEqual(['Alpha Dock', 'Zeta Yard'])
    expect(session.siteId).toBe('s-home')
    expect(session.roles).toEqual(['technician'])
    expect(session.can('log.sign')).toBe(false)
    expect(session.can('charge.record')).toBe(true)
    expect(session.units).toBe('us')
  })

  it('follows the site switcher, with that site\'s roles and units', () => {
    const session = useSessionStore()
    session.me = me
    session.chooseSite('s-away')
    expect(session.siteId).toBe('s-away')
    expect(session.primaryRole).toBe('safety_lead')
    expect(session.can('log.sign')).toBe(true)
    expect(session.canAt('s-home', 'log.sign')).toBe(false)
    expect(session.units).toBe('metric')
  })
})

describe('typed tag codes', () => {
  it('refuses text that is not a tag code with a plain message', async () => {
    const wrapper = await mountSuspended(ScanCodeForm)
    await wrapper.find('input[name="code"]').setValue('pallet 7')
    await wrapper.find('form').trigger('submit')
    expect(wrapper.text()).toContain('like B-00012')
  })
})
