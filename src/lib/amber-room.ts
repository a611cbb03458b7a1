import { useCallback, useSyncExternalStore } from 'react';

// The amber-room scheme is a per-device choice (a phone in the litho bay, a wall screen),
// so it lives in localStorage, not in the user's account.
const STORAGE_KEY = 'faultline.amber-room';
const ATTRIBUTE = 'data-amber-room';

function readStored(): boolean {
  try {
    return localStorage.getItem(STORAGE_KEY) === 'true';
  } catch {
    return false; // storage blocked (private mode, policy): fall back to the normal scheme
  }
}

function apply(on: boolean): void {
  if (on) document.documentElement.setAttribute(ATTRIBUTE, 'true');
  else document.documentElement.removeAttribute(ATTRIBUTE);
}

/** Called before the first render so the page never flashes the wrong scheme. */
export function applyStoredAmberRoom(): void {
  apply(readStored());
}

const listeners = new Set<() => void>();

function subscribe(listener: () => void): () => void {
  listeners.add(listener);
  // Another tab on the same device switched: follow it.
  const onStorage = (event: StorageEvent) => {
    if (event.key !== STORAGE_KEY) return;
    apply(readStored());
    listener();
  };
  window.addEventListener('storage', onStorage);
  return () => {
    listeners.delete(listener);
    window.removeEventListener('storage', onStorage);
  };
}

function isOn(): boolean {
  return document.documentElement.getAttribute(ATTRIBUTE) === 'true';
}

export function setAmberRoom(on: boolean): void {
  apply(on);
  try {
    localStorage.setItem(STORAGE_KEY, String(on));
  } catch {
    // Not remembered, but still applied for this visit.
  }
  for (const listener of listeners) listener();
}

export function useAmberRoom(): [on: boolean, setOn: (on: boolean) => void] {
  const on = useSyncExternalStore(subscribe, isOn, () => false);
  const setOn = useCallback((next: boolean) => setAmberRoom(next), []);
  return [on, setOn];
}
