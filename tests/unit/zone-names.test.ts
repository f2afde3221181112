// The zone list's current names. Outside reference: the ICU time-zone data shipped in Node's Intl,
// whose alias table maps each current IANA name back to ICU's canonical (older) ID; the renames
// themselves are from the tz database's `backward` file (from memory, hence this check).
import { describe, expect, it } from 'vitest'
import { CURRENT_ZONE_NAMES, currentZoneList, currentZoneName } from '../../shared/zone-names'

function icuCanonical(zone: string): string {
  return new Intl.DateTimeFormat('en', { timeZone: zone }).resolvedOptions().timeZone
}

describe('current IANA zone names', () => {
  it('maps every old name to a zone that ICU treats as the same zone', () => {
    for (const [old, current] of Object.entries(CURRENT_ZONE_NAMES)) {
      expect(icuCanonical(current), `${current} is an alias of ${old}`).toBe(icuCanonical(old))
    }
  })

  it('finds Nuuk, Kolkata and Kyiv in the list built from Intl.supportedValuesOf, and no old name', () => {
    const list = currentZoneList(Intl.supportedValuesOf('timeZone'))
    expect(list).toEqual(expect.arrayContaining(['America/Nuuk', 'Asia/Kolkata', 'Europe/Kyiv', 'Antarctica/Troll']))
    for (const old of Object.keys(CURRENT_ZONE_NAMES)) expect(list).not.toContain(old)
    expect(list.filter(z => z.toLowerCase().includes('nuuk'))).toEqual(['America/Nuuk'])
  })

  it('leaves names that were never renamed as they are', () => {
    expect(currentZoneName('Europe/Oslo')).toBe('Europe/Oslo')
    expect(currentZoneName('America/Godthab')).toBe('America/Nuuk')
  })
})
