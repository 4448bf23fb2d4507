/**
 * The demo scenario's invented region, "the Serevan Coast": a landmass with a mountain range,
 * placed over open ocean in the South Atlantic so that no real coastline lies under it.
 * Everything here is invented; the app marks it as such wherever it is shown.
 */

export const DEMO_NOTICE = 'Invented demo scenario: the Serevan Coast, its towns, stakeholders and forecasts do not exist.'

/** Outer coastline of the invented landmass, [lon, lat], counter-clockwise, closed. */
export const SEREVAN_COAST: [number, number][] = [
  [-25.6, -46.6], [-24.4, -46.9], [-23.1, -46.7], [-22.2, -46.2], [-21.6, -45.5], [-21.1, -44.9],
  [-20.6, -44.2], [-20.3, -43.5], [-20.5, -42.9], [-21.2, -42.5], [-21.9, -42.6], [-22.5, -42.2],
  [-23.3, -42.0], [-24.1, -42.3], [-24.6, -42.9], [-25.4, -43.2], [-26.1, -43.8], [-26.4, -44.6],
  [-26.6, -45.4], [-26.3, -46.1], [-25.6, -46.6],
]

/** Crest line of the invented Kaldor Range, [lon, lat]; peaks near 1900 m. */
export const KALDOR_RIDGE: [number, number][] = [[-25.2, -45.9], [-24.2, -45.1], [-23.2, -44.3], [-22.2, -43.4]]

export interface DemoPlace { name: string; lon: number; lat: number; kind: 'town' | 'port' | 'pass' | 'venue' | 'substation' }

export const DEMO_PLACES: DemoPlace[] = [
  { name: 'Port Aveline', lon: -21.5, lat: -44.6, kind: 'port' },
  { name: 'Miro Falls', lon: -24.9, lat: -44.0, kind: 'town' },
  { name: 'Tessel Bay', lon: -23.4, lat: -46.4, kind: 'town' },
  { name: 'Kaldor Pass', lon: -23.7, lat: -44.7, kind: 'pass' },
  { name: 'Brinmoor Meadows', lon: -22.6, lat: -42.9, kind: 'venue' },
  { name: 'Lowen substation', lon: -25.7, lat: -45.3, kind: 'substation' },
]

/** Invented stakeholder organisations of the demo. */
export const DEMO_STAKEHOLDERS = [
  { name: 'Serevan Regional Roads', purpose: 'Gritting and closures on the coast road and Kaldor Pass' },
  { name: 'Aveline Ferry Line', purpose: 'Crossings from Port Aveline across the Sound' },
  { name: 'Brinmoor Open-Air Festival', purpose: 'Three-day outdoor event on Brinmoor Meadows' },
  { name: 'Serevan Grid', purpose: 'Overhead power lines across the Kaldor Range' },
]

/** The coarse model grid of the demo: regular lon-lat, cell centres. */
export const DEMO_GRID = { west: -28.0, south: -48.4, dlon: 0.26, dlat: 0.19, nx: 32, ny: 32 }
