import { create } from 'zustand';
import type { AnnotatorRole } from '../core/backup/model';

/**
 * Who is labelling at this browser, and how. Kept in localStorage, not in the database: it belongs
 * to the person at this machine, not to a project (the project's annotators table gets a row the
 * first time they write a layer there).
 */
export interface Profile {
  /** The layer owner id written into layers (`annotatorIdCheck` rules). */
  id: string;
  name: string;
  role: AnnotatorRole;
}

export interface SessionState {
  profile: Profile | null;
  /** Hide other annotators' layers while labelling; on by default for annotators. */
  blind: boolean;
  profileSet: (profile: Profile | null) => void;
  blindSet: (blind: boolean) => void;
}

export const SESSION_STORAGE_KEY = 'slotsmith.session';

interface Stored {
  profile: Profile | null;
  blind?: boolean;
}

function storageRead(): Stored {
  try {
    const text = typeof localStorage === 'undefined' ? null : localStorage.getItem(SESSION_STORAGE_KEY);
    if (text === null) return { profile: null };
    const value = JSON.parse(text) as Partial<Stored>;
    const p = value.profile;
    const profile =
      p !== null && typeof p === 'object' && typeof p?.id === 'string' && typeof p.name === 'string' && (p.role === 'annotator' || p.role === 'adjudicator')
        ? { id: p.id, name: p.name, role: p.role }
        : null;
    return { profile, ...(typeof value.blind === 'boolean' && { blind: value.blind }) };
  } catch {
    // A damaged entry (hand-edited, another version) only costs choosing the profile again.
    return { profile: null };
  }
}

function storageWrite(state: Stored): void {
  try {
    if (typeof localStorage !== 'undefined') localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify(state));
  } catch {
    // Private windows may refuse storage; the session then lasts until the tab closes.
  }
}

/** Blind by default for annotators; adjudicators need every layer. */
export function blindDefault(profile: Profile | null): boolean {
  return profile?.role !== 'adjudicator';
}

const initial = storageRead();

export const useSession = create<SessionState>((set, get) => ({
  profile: initial.profile,
  blind: initial.blind ?? blindDefault(initial.profile),
  profileSet: (profile) => {
    const blind = blindDefault(profile);
    storageWrite({ profile, blind });
    set({ profile, blind });
  },
  blindSet: (blind) => {
    storageWrite({ profile: get().profile, blind });
    set({ blind });
  },
}));
