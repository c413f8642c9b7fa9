/**
 * Utterance templates. `{name}` is a filler: a slot (service, a:service, problem, area, day,
 * day:bare, time, time:bare, budget, phone, ref) or fluff (hi, end); `{name?}` appears half the
 * time. `alt` names the intent a careful reader could also choose: annotators disagree there.
 */
import type { CorpusIntent } from './schema';

export interface Template {
  id: string;
  intent: CorpusIntent;
  alt?: CorpusIntent;
  text: string;
}

type Row = readonly [text: string, alt?: CorpusIntent];

const ROWS: Record<CorpusIntent, readonly Row[]> = {
  book_visit: [
    ['{hi}can I book {a:service} for {day:bare} {time?}?{end}'],
    ['{hi}I need {a:service} in {area} {day?}.{end}'],
    ['{hi}need {a:service} asap, got {problem}{end}'],
    ['{hi}I\'ve got {problem} and need {a:service} {day} {time?}.{end}'],
    ['{hi}could you send someone round to {area} {day} {time?}? we have {problem}{end}'],
    ['{hi}looking for {a:service} near {area}, budget is {budget}.{end}'],
    ['{hi}please book {a:service} {day} {time}. my number is {phone}{end}'],
    ['{hi}{problem} in the kitchen, can someone come {day} {time?}?{end}'],
    ['{hi}book me in for {day:bare} {time?} pls, it\'s {problem}{end}'],
    ['{hi}I\'d like to arrange a visit from {a:service} {day?}.{end}'],
    ['{hi}is there {a:service} available {day} {time?}?{end}'],
    ['{hi}can you get {a:service} out to {area} {day}? {problem}{end}'],
    ['{hi}we need {a:service} for {problem} in {area}, {day} {time?}.{end}'],
    ['{hi}I want someone to look at {problem} {day} {time?}, call {phone}{end}'],
    ['{hi}hoping to get {a:service} round {day} {time}, can pay {budget}{end}'],
    ['{hi}{service} needed in {area} {day} {time}{end}'],
    ['{hi}help!! {problem}, need {a:service} {day}{end}'],
    ['{hi}i\'m in {area} and need {a:service} {day} {time?} for {problem}{end}'],
    ['{hi}can someone fix {problem} {day}? we\'re in {area}{end}'],
    ['{hi}book {a:service} {day} {time}{end}'],
    ['{hi}looking for {a:service} {day} {time?}, budget {budget}, number {phone}{end}'],
    ['{hi}could I get {a:service} {day}? text me on {phone}{end}'],
    ['{hi}{problem} again 😩 need {a:service} {day}{end}'],
    ['{hi}can you squeeze in {a:service} {day} {time}?{end}', 'reschedule'],
    ['{hi}how soon can {a:service} get to {area}? it\'s {problem}{end}', 'ask_price'],
    ['{hi}can {a:service} come {day} and how much would that be?{end}', 'ask_price'],
    ['{hi}we have {problem} at our flat in {area}, any {service} free {time}?{end}'],
  ],
  reschedule: [
    ['{hi}can I move my booking {ref} to {day:bare}?{end}'],
    ['{hi}I need to reschedule the {service} to {day:bare} {time?}{end}'],
    ['{hi}can we change {ref} to {day:bare} {time} instead?{end}'],
    ['{hi}something\'s come up, could the {service} come {day} instead?{end}'],
    ['{hi}please push my appointment to {day:bare}.{end}'],
    ['{hi}can you make it {day} {time} instead, ref {ref}{end}'],
    ['{hi}rebook {ref} for {day:bare} please'],
    ['{hi}the {service} is booked for {day:bare} but I can\'t do it, can we do {day:bare} instead?{end}'],
    ['{hi}any chance of an earlier slot than {day:bare}?{end}', 'check_status'],
    ['{hi}could I switch to {time:bare} rather than {time:bare}?{end}'],
    ['{hi}I\'m not in {day} any more, can you come {day} {time?}?{end}'],
    ['{hi}change my booking to {day:bare}, number {phone}{end}'],
    ['{hi}can we do {day} {time} instead?{end}', 'confirm'],
    ['{hi}move the visit for {ref} to {time:bare} please{end}'],
    ['{hi}could the {service} come {time} rather than {time}? my ref is {ref}{end}'],
    ['{hi}I won\'t be home {day}, can the {service} come another day?{end}', 'cancel'],
  ],
  cancel: [
    ['{hi}please cancel {ref}.{end}'],
    ['{hi}I need to cancel the {service} {day}.{end}'],
    ['{hi}cancel my booking for {day:bare}, ref {ref}{end}'],
    ['{hi}we don\'t need the {service} any more, fixed {problem} ourselves{end}'],
    ['{hi}cancel {ref} pls'],
    ['{hi}cancel the appointment for {day:bare} {time?}.{end}'],
    ['{hi}no longer need the {service}, please cancel{end}'],
    ['{hi}I have to cancel, sorry. booking ref {ref}{end}'],
    ['{hi}can you call off the {service} visit {day}? {phone}{end}'],
    ['{hi}don\'t send the {service} {day}, we sorted it{end}'],
    ['{hi}please scrap the visit {day} {time?}{end}'],
    ['{hi}I don\'t think I need the {service} {day} after all{end}', 'reschedule'],
    ['{hi}cancel {ref} and I\'ll rebook later{end}', 'reschedule'],
  ],
  ask_price: [
    ['{hi}how much for {a:service} {day?}?{end}'],
    ['{hi}how much does it cost to fix {problem}?{end}'],
    ['{hi}what do you charge for {problem}?{end}'],
    ['{hi}what\'s the call-out fee for {a:service} in {area}?{end}'],
    ['{hi}can you do {problem} for {budget}?{end}'],
    ['{hi}roughly how much is {a:service} per hour?{end}'],
    ['{hi}is {budget} enough to sort {problem}?{end}'],
    ['{hi}price for {a:service} {day} {time}?{end}'],
    ['{hi}do you charge more {time}?{end}'],
    ['{hi}quote please for {problem} in {area}{end}'],
    ['{hi}what would {a:service} cost me? I can spend {budget}{end}'],
    ['{hi}how much would you charge to fix {problem} {day}?{end}', 'book_visit'],
    ['{hi}is it dearer to get {a:service} {day}?{end}'],
    ['{hi}do you have a fixed price for {problem}? budget {budget}{end}'],
    ['{hi}I\'d like {a:service} for {problem} if it\'s {budget}{end}', 'book_visit'],
  ],
  check_status: [
    ['{hi}where is my {service}?{end}'],
    ['{hi}is {ref} still on for {day:bare}?{end}'],
    ['{hi}what time is the {service} coming {day}?{end}'],
    ['{hi}any update on {ref}?{end}'],
    ['{hi}has my booking been confirmed? number {phone}{end}'],
    ['{hi}the {service} was meant to be here {time}, where are they?{end}'],
    ['{hi}is someone still coming {day} {time?}?{end}'],
    ['{hi}status of booking {ref} please'],
    ['{hi}just checking the {service} is booked for {day:bare}{end}', 'confirm'],
    ['{hi}did you get my request for {a:service} in {area}?{end}'],
    ['{hi}when will the {service} arrive?{end}'],
    ['{hi}can you confirm {ref} is {day} {time?}?{end}', 'confirm'],
    ['{hi}still waiting for the {service} in {area}, any news?{end}'],
    ['{hi}is the {service} on the way? ref {ref}{end}'],
  ],
  confirm: [
    ['{day} {time} works{end}'],
    ['yes {day} {time} is fine{end}'],
    ['perfect, see you {day}{end}'],
    ['yep that\'s fine{end}'],
    ['ok book it{end}', 'book_visit'],
    ['sounds good, my number is {phone}{end}'],
    ['great, {time:bare} suits me{end}'],
    ['yes please{end}'],
    ['{day:bare} is good for us{end}'],
    ['that\'s fine, call {phone} when you\'re close{end}'],
  ],
  other: [
    ['{hi}thanks so much{end}'],
    ['{hi}are you a real person?{end}'],
    ['{hi}do you do gardening?{end}'],
    ['{hi}what are your opening hours?{end}'],
    ['ok thanks bye{end}'],
    ['hello?{end}'],
    ['{hi}can I pay by card?{end}'],
    ['{hi}do you cover {area}?{end}', 'book_visit'],
    ['lol ok'],
    ['{hi}is the {service} insured?{end}', 'ask_price'],
    ['{hi}how do I leave a review?{end}'],
  ],
};

/** Relative frequency of each intent in the corpus. */
export const INTENT_WEIGHTS: Record<CorpusIntent, number> = {
  book_visit: 30,
  reschedule: 15,
  cancel: 12,
  ask_price: 15,
  check_status: 14,
  confirm: 7,
  other: 7,
};

function templatesBuild(): Record<CorpusIntent, Template[]> {
  const out = {} as Record<CorpusIntent, Template[]>;
  for (const intent of Object.keys(ROWS) as CorpusIntent[]) {
    out[intent] = (ROWS[intent] ?? []).map(([text, alt], i) => {
      const template: Template = { id: `${intent}-${String(i + 1).padStart(2, '0')}`, intent, text };
      if (alt !== undefined) template.alt = alt;
      return template;
    });
  }
  return out;
}

export const TEMPLATES: Record<CorpusIntent, Template[]> = templatesBuild();
