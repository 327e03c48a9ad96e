/**
 * The demo scenario: an invented hospital network. Every name and number here is fictional.
 * The registry's case generator (cases.ts) builds on these sites and units.
 */
export const NETWORK = { name: 'Tidewater Valley Health Partnership', timeZone: 'Europe/Lisbon' };

export const DEMO_PASSWORD = 'tidewater-demo-2026';

export const SITES = [
  { code: 'HBR', name: 'Harbour Row General Hospital', size: 1.0, protocolStart: '2024-03-01',
    inclusion: 'Adults (18 years or older) admitted for a listed procedure category under general or regional anaesthesia with at least one post-operative night.',
    exclusion: 'Day-case procedures; patients ventilated before surgery; transfers in after post-operative day 0.' },
  { code: 'KSV', name: 'Kestrel Vale Hospital', size: 0.7, protocolStart: '2024-06-01',
    inclusion: 'Adults admitted for elective or emergency abdominal, thoracic or orthopaedic surgery under general or regional anaesthesia.',
    exclusion: 'Day-case procedures; obstetric procedures; patients already in intensive care before surgery.' },
  { code: 'MRB', name: 'Marrowby District Hospital', size: 0.45, protocolStart: '2024-09-01',
    inclusion: 'Adults admitted for a listed procedure category with an expected stay of at least 24 hours.',
    exclusion: 'Day-case procedures; patients transferred to another hospital within 24 hours.' },
  { code: 'CLF', name: 'Cliffend Community Hospital', size: 0.15, protocolStart: '2025-01-01',
    inclusion: 'Adults admitted for general or orthopaedic surgery under general or regional anaesthesia.',
    exclusion: 'Day-case procedures.' },
] as const;

export const UNITS = [
  { code: 'SURG-A', name: 'Surgical ward A', kind: 'ward' },
  { code: 'SURG-B', name: 'Surgical ward B', kind: 'ward' },
  { code: 'ORTHO', name: 'Orthopaedic ward', kind: 'ward' },
  { code: 'ICU', name: 'Intensive care', kind: 'icu' },
] as const;

/** One demo user per role; they exist only in the demo scenario. */
export const DEMO_USERS = [
  { email: 'admin@tidewater.example', displayName: 'Ines Admin (demo)', roles: ['admin'], isChair: false, sites: 'all' },
  { email: 'abstractor@tidewater.example', displayName: 'Abel Abstractor (demo)', roles: ['abstractor'], isChair: false, sites: ['HBR', 'KSV'] },
  { email: 'abstractor2@tidewater.example', displayName: 'Bea Second-Abstractor (demo)', roles: ['abstractor'], isChair: false, sites: ['HBR', 'KSV'] },
  { email: 'analyst@tidewater.example', displayName: 'Anaya Analyst (demo)', roles: ['analyst'], isChair: false, sites: ['HBR', 'KSV', 'MRB', 'CLF'] },
  { email: 'chair@tidewater.example', displayName: 'Cyrus Chair (demo)', roles: ['committee'], isChair: true, sites: ['HBR', 'KSV', 'MRB', 'CLF'] },
  { email: 'committee@tidewater.example', displayName: 'Coral Committee (demo)', roles: ['committee'], isChair: false, sites: ['HBR'] },
  { email: 'researcher@tidewater.example', displayName: 'Rafe Researcher (demo)', roles: ['researcher'], isChair: false, sites: [] },
] as const;
