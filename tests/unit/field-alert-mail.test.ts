// The field alert mail names what DESIGN.md asks of it ("Travel, weather holds, check-out and
// return"): the shift title, the site, the people, when they left and when they were expected; it
// says which step it is, and that an alert is no rescue plan. The party below is invented.
import { describe, expect, it } from 'vitest'
import { renderFieldAlertMail, type FieldAlertProps } from '../../emails/field-alert'

const PROPS: FieldAlertProps = {
  personName: 'Sigrun Test',
  kind: 'overdue',
  step: 1,
  party: {
    title: 'Fuel cache <count>',
    siteName: 'Test Ridge',
    people: 'Ada Test, Bo Test',
    departedText: 'Wed 18 Nov 08:30 (Arctic/Longyearbyen, UTC+01:00)',
    expectedBackText: 'Wed 18 Nov 14:30 (Arctic/Longyearbyen, UTC+01:00)',
    lastCheckInText: 'none since leaving',
    sinceText: '5 min'
  },
  boardUrl: 'https://gloamline.test/field'
}

describe('the field alert mail', () => {
  it('names the shift, site, people, departure and expected return in text and HTML', () => {
    const mail = renderFieldAlertMail(PROPS)
    for (const part of [mail.text, mail.html]) {
      expect(part).toContain('Test Ridge')
      expect(part).toContain('Ada Test, Bo Test')
      expect(part).toContain('Wed 18 Nov 08:30')
      expect(part).toContain('Wed 18 Nov 14:30')
      expect(part).toContain('an alert is no rescue plan')
    }
    expect(mail.text).toContain('Fuel cache <count>')
    // the title is escaped in HTML
    expect(mail.html).toContain('Fuel cache &lt;count&gt;')
    expect(mail.html).not.toContain('Fuel cache <count>')
    expect(mail.subject).toBe('Party overdue: Fuel cache <count> at Test Ridge')
  })

  it('says the step in the subject from the second step on, and words a missed lone-worker check-in', () => {
    expect(renderFieldAlertMail({ ...PROPS, step: 3 }).subject).toBe('Party overdue (reminder 2): Fuel cache <count> at Test Ridge')
    const missed = renderFieldAlertMail({ ...PROPS, kind: 'check-in-missed', party: { ...PROPS.party, people: 'Ada Test' } })
    expect(missed.subject).toMatch(/^Lone worker: check-in missed: /)
    expect(missed.text).toContain('working alone')
  })
})
