import { mountSuspended } from '@nuxt/test-utils/runtime'
import { describe, expect, it } from 'vitest'
import AppMark from '~/components/app/AppMark.vue'
import EmptyState from '~/components/common/EmptyState.vue'

describe('shell components', () => {
  it('the mark is decorative (hidden from screen readers) and sized by prop', async () => {
    const wrapper = await mountSuspended(AppMark, { props: { size: 48 } })
    const svg = wrapper.find('svg')
    expect(svg.attributes('aria-hidden')).toBe('true')
    expect(svg.attributes('width')).toBe('48')
  })

  it('an empty state says what to do next', async () => {
    const wrapper = await mountSuspended(EmptyState, { props: { title: 'Nothing yet' }, slots: { default: () => 'Import a map to start.' } })
    expect(wrapper.find('h2').text()).toBe('Nothing yet')
    expect(wrapper.text()).toContain('Import a map to start.')
  })

  it('navigation depends on the role', () => {
    expect(navigationFor('admin').map(i => i.label)).toContain('People')
    expect(navigationFor('rater').map(i => i.label)).not.toContain('People')
  })

  it('marks the right entry current: "My checks" is not current on the self-check form; rule pages share one entry', () => {
    const items = navigationFor('rater')
    const current = (path: string) => items.filter(i => isCurrentNav(i, path)).map(i => i.label)
    expect(current('/checks/new')).toEqual(['Self-check'])
    expect(current('/checks')).toEqual(['My checks'])
    expect(current('/checks/12')).toEqual(['My checks'])
    expect(current('/zone-maps/3')).toEqual(['Rule tables'])
    expect(current('/')).toEqual(['Dashboard'])
    expect(current('/calculatorx')).toEqual([])
  })
})
