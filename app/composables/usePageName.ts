import type { NavGroup } from '~/utils/navigation'

/** A page's name and a menu group's heading in the reader's language (the English in navigation.ts as fallback). */
export function usePageName() {
  const { t, te } = useI18n()
  const key = (to: string) => `nav.${to === '/' ? 'home' : to.slice(1)}`
  return {
    pageName: (to: string, label: string) => (te(key(to)) ? t(key(to)) : label),
    groupName: (group: NavGroup, label: string) => (label && te(`nav_group.${group}`) ? t(`nav_group.${group}`) : label),
  }
}
