// Photos of an unsent report kept in IndexedDB (localStorage cannot hold pictures), so they
// survive a reload or a dead connection along with the text. Keys are "<userId>:<photoId>" so
// two people sharing a lab tablet never see each other's drafts.

const DB_NAME = 'faultline-drafts';
const STORE = 'photos';

export interface StoredDraftPhoto {
  key: string;
  id: string;
  name: string;
  blob: Blob;
  addedAt: number;
}

function open(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    if (typeof indexedDB === 'undefined') {
      reject(new Error('IndexedDB is not available'));
      return;
    }
    const request = indexedDB.open(DB_NAME, 1);
    request.onupgradeneeded = () => {
      if (!request.result.objectStoreNames.contains(STORE)) request.result.createObjectStore(STORE, { keyPath: 'key' });
    };
    request.onsuccess = () => resolve(request.result);
    request.onerror = () => reject(request.error ?? new Error('IndexedDB failed to open'));
  });
}

async function run<T>(mode: IDBTransactionMode, work: (store: IDBObjectStore) => IDBRequest<T> | void): Promise<T | undefined> {
  const db = await open();
  try {
    return await new Promise<T | undefined>((resolve, reject) => {
      const tx = db.transaction(STORE, mode);
      const request = work(tx.objectStore(STORE));
      tx.oncomplete = () => resolve(request ? request.result : undefined);
      tx.onerror = () => reject(tx.error ?? new Error('IndexedDB transaction failed'));
      tx.onabort = () => reject(tx.error ?? new Error('IndexedDB transaction aborted'));
    });
  } finally {
    db.close();
  }
}

const range = (userId: number) => IDBKeyRange.bound(`${userId}:`, `${userId}:\uffff`);

export async function loadDraftPhotos(userId: number): Promise<StoredDraftPhoto[]> {
  const all = (await run<StoredDraftPhoto[]>('readonly', (s) => s.getAll(range(userId)))) ?? [];
  return all.sort((a, b) => a.addedAt - b.addedAt);
}

export async function saveDraftPhoto(userId: number, photo: { id: string; name: string; blob: Blob }) {
  await run('readwrite', (s) =>
    s.put({ key: `${userId}:${photo.id}`, id: photo.id, name: photo.name, blob: photo.blob, addedAt: Date.now() }),
  );
}

export async function deleteDraftPhoto(userId: number, id: string) {
  await run('readwrite', (s) => s.delete(`${userId}:${id}`));
}

export async function clearDraftPhotos(userId: number) {
  await run('readwrite', (s) => s.delete(range(userId)));
}
