/**
 * Invented vocabulary for the home-repair booking corpus. Phrases mark the slot value with angle
 * brackets: in "on the <3rd>" only "3rd" is the `day` value. Every name, place and number is made up.
 */
import type { Random } from './random';

/** A trade and the problems it fixes, so one utterance never asks a locksmith about a boiler. */
export interface Job {
  services: readonly string[];
  /** Noun phrases; a leading "a "/"an " stays outside the slot. */
  problems: readonly string[];
}

export const JOBS: readonly Job[] = [
  {
    services: ['plumber', 'plumber', 'emergency plumber', 'plumbing engineer'],
    problems: [
      'a leaking tap', 'a dripping tap', 'a burst pipe', 'a blocked sink', 'a blocked toilet',
      'a running toilet', 'low water pressure', 'a leak under the sink', 'water coming through the ceiling',
      'a dripping shower head', 'a toilet that won\'t flush',
    ],
  },
  {
    services: ['electrician', 'electrician', 'sparky', 'electrical engineer'],
    problems: [
      'a tripped fuse', 'flickering lights', 'a dead socket', 'no power in the kitchen', 'a buzzing fuse box',
      'a scorched plug socket', 'a broken light switch', 'half the house without power', 'an outside light not working',
    ],
  },
  {
    services: ['locksmith', 'locksmith', 'emergency locksmith'],
    problems: [
      'a broken lock', 'a snapped key', 'a stiff front door lock', 'a jammed back door', 'a lock that won\'t turn',
      'a key stuck in the door',
    ],
  },
  {
    services: ['boiler engineer', 'gas engineer', 'heating engineer', 'boiler engineer'],
    problems: [
      'no hot water', 'no heating', 'a boiler not firing', 'cold radiators', 'a boiler losing pressure',
      'a pilot light that keeps going out', 'a banging boiler', 'an E119 error on the boiler', 'a noisy boiler',
    ],
  },
  {
    services: ['handyman', 'handyman', 'handy man', 'odd-job man'],
    problems: [
      'a wobbly shelf', 'a squeaky door', 'a flat-pack wardrobe to build', 'a broken fence panel',
      'a curtain rail that fell down', 'a loose banister', 'a sagging gate',
    ],
  },
  {
    services: ['carpenter', 'joiner'],
    problems: ['a door that sticks', 'a rotten window frame', 'a broken stair tread', 'a split skirting board'],
  },
  {
    services: ['roofer', 'roofer'],
    problems: ['missing roof tiles', 'a leaking gutter', 'a leak in the roof', 'a blocked gutter', 'a loose chimney cap'],
  },
  {
    services: ['glazier', 'window fitter'],
    problems: ['a cracked window', 'misted double glazing', 'a smashed pane', 'a window that won\'t close'],
  },
  {
    services: ['drain specialist', 'drain engineer'],
    problems: ['a blocked drain', 'a smelly drain', 'a backed-up outside drain', 'slow drains'],
  },
  {
    services: ['appliance engineer', 'appliance repair person'],
    problems: [
      'a washing machine not draining', 'an oven not heating', 'a fridge not cooling', 'a dishwasher that leaks',
      'a tumble dryer that won\'t spin',
    ],
  },
];

/** Made-up neighbourhood names (checked against nothing real on purpose: they are compounds we coined). */
export const NEIGHBOURHOODS: readonly string[] = [
  'Quillfield', 'North Quillfield', 'Marrowgate', 'Brackenhythe', 'Larkspur Row', 'Oakhollow', 'Fennel Cross',
  'Ashcombe Vale', 'Wrenfold', 'Saltmere End', 'Copperleigh', 'Thistledown', 'Nettlebury', 'Hollins Reach',
  'Pebblewick', 'Kestrel Heights', 'Mossbank Green', 'Old Tannery Quarter', 'Sorrelford', 'Lantern Wharf',
  'Bramblecote', 'Tidewell', 'Juniper Yard', 'Upper Sorrelford', 'Gullwick on Sea',
];

export const WEEKDAYS = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const;
export const WEEKDAY_SHORT = ['Mon', 'Tues', 'Weds', 'Thurs', 'Fri', 'Sat', 'Sun'] as const;
export const MONTHS = [
  'January', 'February', 'March', 'April', 'May', 'June',
  'July', 'August', 'September', 'October', 'November', 'December',
] as const;

export function ordinal(n: number): string {
  const lastTwo = n % 100;
  if (lastTwo >= 11 && lastTwo <= 13) return `${n}th`;
  const suffix = ['th', 'st', 'nd', 'rd'][n % 10] ?? 'th';
  return `${n}${suffix}`;
}

/** A fictional postcode: UK postcodes never start with Q or X, so these cannot collide with real ones. */
export function postcodeMake(rng: Random): string {
  const letters = 'ABDEFGHJLNPRSTUWXY';
  const outward = `${rng.pick(['Q', 'X'])}${letters[rng.int(letters.length)] ?? 'A'}${1 + rng.int(19)}`;
  if (rng.chance(0.4)) return outward;
  const inward = `${rng.int(10)}${letters[rng.int(letters.length)] ?? 'A'}${letters[rng.int(letters.length)] ?? 'B'}`;
  return `${outward} ${inward}`;
}

/** The fictional 555-0100..555-0199 range, spelled several ways. */
export function phoneMake(rng: Random): string {
  const last = String(rng.int(100)).padStart(2, '0');
  return rng.weighted([
    [4, `555-01${last}`],
    [2, `(555) 01${last}`],
    [1, `555 01${last}`],
    [1, `55501${last}`],
    [1, `555.01${last}`],
  ]);
}

export function bookingRefMake(rng: Random): string {
  const digits = String(1000 + rng.int(9000));
  return rng.weighted([
    [4, `HR-${digits}`],
    [2, `HR${digits}`],
    [1, `hr-${digits}`],
    [1, `HR ${digits}`],
    [2, `BK${digits}`],
  ]);
}

function hourLabel(hour24: number, rng: Random, withSuffix: boolean): string {
  const hour = hour24 > 12 ? hour24 - 12 : hour24;
  if (!withSuffix) return String(hour);
  const suffix = hour24 >= 12 ? 'pm' : 'am';
  return rng.chance(0.8) ? `${hour}${suffix}` : `${hour} ${suffix}`;
}

/** A day phrase. `bare` suits "for ..." and "the visit ..."; otherwise it is adverbial ("on Tuesday"). */
export function dayPhrase(rng: Random, bare: boolean): string {
  const weekday = rng.chance(0.85) ? rng.pick(WEEKDAYS) : rng.pick(WEEKDAY_SHORT);
  const month = rng.chance(0.85) ? rng.pick(MONTHS) : rng.pick(MONTHS).slice(0, 3);
  const date = 1 + rng.int(28);
  const on = bare ? '' : 'on ';
  return rng.weighted([
    [6, '<tomorrow>'],
    [2, '<today>'],
    [1, 'the <day after tomorrow>'],
    [5, `${rng.chance(0.6) ? on : ''}<${weekday}>`],
    [4, `<next ${weekday}>`],
    [2, `<this ${weekday}>`],
    [2, '<this weekend>'],
    [1, '<next week>'],
    [1, `<${weekday} week>`],
    [3, `${on}the <${ordinal(date)}>`],
    [2, `${on}<${date} ${month}>`],
    [2, `${on}<${month} ${ordinal(date)}>`],
    [1, `${on}the <${ordinal(date)} of ${month}>`],
    [1, `${on}<${date}/${String(1 + rng.int(12)).padStart(2, '0')}>`],
    [1, '<mañana>'],
  ]);
}

/** A time-of-day phrase; bounding words (between, after, before) are part of the value. */
export function timePhrase(rng: Random, bare: boolean): string {
  const start = 8 + rng.int(9);
  const end = start + 1 + rng.int(3);
  const suffix = rng.chance(0.5);
  const inThe = bare ? 'the ' : 'in the ';
  return rng.weighted([
    [4, `${inThe}<morning>`],
    [3, `${inThe}<afternoon>`],
    [2, `${inThe}<evening>`],
    [2, '<morning>'],
    [1, `${inThe}<early afternoon>`],
    [1, '<late morning>'],
    [2, '<first thing>'],
    [1, `${bare ? '' : 'at '}<lunchtime>`],
    [4, `<between ${hourLabel(start, rng, suffix)} and ${hourLabel(end, rng, true)}>`],
    [2, `<${hourLabel(start, rng, false)}-${hourLabel(end, rng, suffix)}>`],
    [2, `<after ${hourLabel(15 + rng.int(4), rng, rng.chance(0.7))}>`],
    [1, `<before ${rng.chance(0.5) ? 'noon' : hourLabel(9 + rng.int(3), rng, true)}>`],
    [1, `<from ${hourLabel(start, rng, false)} to ${hourLabel(end, rng, true)}>`],
    [1, `${bare ? '' : rng.pick(['at ', 'around '])}<${hourLabel(start, rng, true)}>`],
    [1, `${bare ? '' : 'at '}<${hourLabel(start, rng, false)}:${rng.pick(['00', '15', '30', '45'])}>`],
    [1, `<any time after ${hourLabel(16 + rng.int(3), rng, false)}>`],
    [1, `<${hourLabel(start, rng, false)}ish>`],
    [1, '<this evening>'],
  ]);
}

const NUMBER_WORDS: Record<number, string> = { 50: 'fifty', 100: 'a hundred', 200: 'two hundred' };

/** A budget phrase; the limiting word is part of the value. */
export function budgetPhrase(rng: Random): string {
  const amount = rng.pick([40, 50, 60, 75, 80, 90, 100, 120, 150, 180, 200, 250, 300, 400]);
  const words = NUMBER_WORDS[amount];
  const money = rng.weighted([
    [4, `£${amount}`],
    [2, `${amount} pounds`],
    [2, `${amount} quid`],
    [2, `$${amount}`],
    [2, `${amount} dollars`],
    [1, `${amount} bucks`],
    [1, `€${amount}`],
    [1, `${amount} euros`],
    [1, `${amount} GBP`],
    [words === undefined ? 0 : 1, `${words ?? ''} quid`],
  ]);
  return rng.weighted([
    [4, `<${money}>`],
    [3, `<under ${money}>`],
    [2, `<max ${money}>`],
    [1, `<up to ${money}>`],
    [2, `<about ${money}>`],
    [1, `<around ${money}>`],
    [1, `<no more than ${money}>`],
    [1, `<less than ${money}>`],
    [1, `<${money} tops>`],
    [1, `<${money} max>`],
  ]);
}

export function areaValue(rng: Random): string {
  return rng.chance(0.7) ? rng.pick(NEIGHBOURHOODS) : postcodeMake(rng);
}

export function articleFor(word: string): string {
  return /^[aeiou]/iu.test(word) ? 'an' : 'a';
}

/** Opening fluff; empty half the time. Carries its own trailing space or punctuation. */
export const GREETINGS: readonly (readonly [number, string])[] = [
  [50, ''],
  [6, 'hi '], [5, 'hi, '], [4, 'hello, '], [2, 'hiya '], [3, 'hey '], [1, 'hey there, '],
  [2, 'good morning, '], [1, 'morning! '], [1, 'evening, '], [1, 'hola, '], [1, 'bonjour, '],
  [1, 'hi team, '], [1, 'hello?? '], [2, 'ok so '], [1, 'um '], [1, 'quick one: '], [2, 'sorry to bother you, '],
];

export const POLITE_ENDINGS: readonly (readonly [number, string])[] = [
  [4, ' please'], [2, ' pls'], [1, ' plz'], [3, ' thanks'], [2, ', thanks!'], [2, ' thank you'], [2, ' cheers'],
  [1, ' ta'], [1, ' thx'], [1, ' if poss'], [1, ' asap'], [1, ' merci'], [1, ' gracias'], [1, ' danke'],
  [1, ' por favor'], [1, ', s\'il vous plaît'], [1, ' many thanks x'],
];

export const EMOJI: readonly string[] = ['🙏', '😊', '👍', '🔧', '😩', '🚿', '💧', '⚡', '🔑', '🙂', '👍🏽'];
