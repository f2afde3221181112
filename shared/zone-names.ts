// Current IANA names for the zones that browsers' and Node's ICU data still list under an older
// name (Intl.supportedValuesOf('timeZone') returns ICU's canonical IDs, which keep pre-rename names).
// Renames from the tz database's `backward` file (America/Godthab → America/Nuuk in 2020a,
// Europe/Kiev → Europe/Kyiv in 2022b, Asia/Calcutta → Asia/Kolkata, …), written down from memory and
// checked against ICU's own alias table in tests/unit/zone-names.test.ts. No imports.

export const CURRENT_ZONE_NAMES: Readonly<Record<string, string>> = {
  'Africa/Asmera': 'Africa/Asmara',
  'America/Buenos_Aires': 'America/Argentina/Buenos_Aires',
  'America/Catamarca': 'America/Argentina/Catamarca',
  'America/Coral_Harbour': 'America/Atikokan',
  'America/Cordoba': 'America/Argentina/Cordoba',
  'America/Godthab': 'America/Nuuk',
  'America/Indianapolis': 'America/Indiana/Indianapolis',
  'America/Jujuy': 'America/Argentina/Jujuy',
  'America/Louisville': 'America/Kentucky/Louisville',
  'America/Mendoza': 'America/Argentina/Mendoza',
  'Asia/Calcutta': 'Asia/Kolkata',
  'Asia/Katmandu': 'Asia/Kathmandu',
  'Asia/Rangoon': 'Asia/Yangon',
  'Asia/Saigon': 'Asia/Ho_Chi_Minh',
  'Atlantic/Faeroe': 'Atlantic/Faroe',
  'Europe/Kiev': 'Europe/Kyiv',
  'Pacific/Enderbury': 'Pacific/Kanton',
  'Pacific/Ponape': 'Pacific/Pohnpei',
  'Pacific/Truk': 'Pacific/Chuuk'
}

/** The current IANA name of a zone (the zone itself when it was never renamed). */
export function currentZoneName(zone: string): string {
  return CURRENT_ZONE_NAMES[zone] ?? zone
}

/** A list of zone names with each old name replaced by its current one, without duplicates, sorted. */
export function currentZoneList(zones: readonly string[]): string[] {
  return [...new Set(zones.map(currentZoneName))].sort()
}
