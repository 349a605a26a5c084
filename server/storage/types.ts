/** A stored object: its bytes and the content type it was stored with. */
export interface StoredFile {
  body: Buffer;
  contentType: string;
}

/**
 * Where uploaded files (photos of installed labels and of field mismatches) live.
 *
 * Keys are made by callers as `org/<orgId>/<uuid>.<ext>` (see `makeFileKey`); every method refuses a key
 * that is not safe (see `assertValidKey`) by rejecting with a `FileKeyError`.
 * `delete` of a missing key is not an error; `get` of a missing key resolves to null.
 */
export interface FileStore {
  put(key: string, body: Buffer, contentType: string): Promise<void>;
  get(key: string): Promise<StoredFile | null>;
  delete(key: string): Promise<void>;
  exists(key: string): Promise<boolean>;
  readonly kind: 'local' | 's3';
}
