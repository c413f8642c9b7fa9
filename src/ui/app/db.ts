import { dbOpen, type SlotsmithDb } from '../../db';

let instance: SlotsmithDb | undefined;

/** The one database of this tab (IndexedDB `slotsmith`); opened on first use. */
export function appDb(): SlotsmithDb {
  instance ??= dbOpen();
  return instance;
}
