import { useState, useSyncExternalStore } from 'react';

/**
 * A yes/no flag one component sets and another reads, without re-rendering their common
 * parent: the design form reports unsaved edits, the freeze panel reads them. (Re-rendering the
 * form from its parent hands react-hook-form a fresh `values` object, which resets its dirty
 * state.)
 */
export type Flag = { get: () => boolean; set: (value: boolean) => void; subscribe: (listener: () => void) => () => void };

export function createFlag(initial = false): Flag {
  let value = initial;
  const listeners = new Set<() => void>();
  return {
    get: () => value,
    set: (next) => {
      if (next === value) return;
      value = next;
      listeners.forEach((l) => l());
    },
    subscribe: (listener) => {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
}

/** A flag that lives as long as the component that creates it. */
export function useFlag(): Flag {
  return useState(() => createFlag())[0];
}

/** The flag's current value; re-renders the reader when it changes. */
export function useFlagValue(flag: Flag): boolean {
  return useSyncExternalStore(flag.subscribe, flag.get, () => false);
}
