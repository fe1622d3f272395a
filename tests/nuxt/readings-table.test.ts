import { mountSuspended } from '@nuxt/test-utils/runtime'
import { describe, expect, it } from 'vitest'
import { reactive } from 'vue'
import LeakageReadingsTable from '~/components/leakage/LeakageReadingsTable.vue'

function pasteEvent(text: string): Event {
  const event = new Event('paste', { bubbles: true, cancelable: true })
  Object.defineProperty(event, 'clipboardData', { value: { getData: () => text } })
  return event
}

describe('readings table', () => {
  it('pasting two spreadsheet columns (tab-separated, with a header) fills the rows', async () => {
    const readings = reactive([{ pressure: '', flow: '' }])
    const wrapper = await mountSuspended(LeakageReadingsTable, { props: { readings, errors: {} } })
    const text = 'Pressure\tFlow\n-10\t502\n-15\t629\n-20\t780\n'
    wrapper.find('table').element.dispatchEvent(pasteEvent(text))
    await wrapper.vm.$nextTick()
    expect(readings).toEqual([{ pressure: '-10', flow: '502' }, { pressure: '-15', flow: '629' }, { pressure: '-20', flow: '780' }])
    expect(wrapper.text()).toContain('Pasted 3 reading(s); skipped 1 line(s)')
  })

  it('semicolon-separated lines paste too; a single value is left to the input', async () => {
    const readings = reactive([{ pressure: '', flow: '' }])
    const wrapper = await mountSuspended(LeakageReadingsTable, { props: { readings, errors: {} } })
    wrapper.find('table').element.dispatchEvent(pasteEvent('-25;885\n-30;1010'))
    await wrapper.vm.$nextTick()
    expect(readings).toHaveLength(2)
    const single = pasteEvent('42')
    wrapper.find('table').element.dispatchEvent(single)
    expect(single.defaultPrevented).toBe(false)
    expect(readings).toHaveLength(2)
  })

  it('shows the error of a reading next to its input', async () => {
    const readings = reactive([{ pressure: '50', flow: '900' }])
    const wrapper = await mountSuspended(LeakageReadingsTable, { props: { readings, errors: { 'test.readings.0.pressure': 'Depressurization readings must be negative.' } } })
    expect(wrapper.find('[data-test=pressure-0]').attributes('aria-invalid')).toBe('true')
    expect(wrapper.text()).toContain('Depressurization readings must be negative.')
  })
})
