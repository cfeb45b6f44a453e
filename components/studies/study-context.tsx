'use client';

import { createContext, useContext } from 'react';
import type { Role } from '@/lib/shared/roles';
import { roleAtLeast } from '@/lib/shared/roles';
import type { StudyDto } from '@/lib/client/studies';

export type StudyContextValue = { study: StudyDto; role: Role; can: (needed: Role) => boolean };

export const StudyContext = createContext<StudyContextValue | null>(null);

/** The current study and the signed-in user's role in it (inside a study page). */
export function useStudyContext(): StudyContextValue {
  const value = useContext(StudyContext);
  if (!value) throw new Error('useStudyContext must be used inside a study page');
  return value;
}

export function makeStudyContext(study: StudyDto, role: Role): StudyContextValue {
  return { study, role, can: (needed) => roleAtLeast(role, needed) };
}
