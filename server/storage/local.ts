// The file store in a local folder (the default): written under a temporary name and renamed, so a
// reader never sees half a file; the temporary names of interrupted writes end in `.part`.
import { randomUUID } from 'node:crypto';
import { copyFile, mkdir, open, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { BlobMissingError, blobPath, isBlobKey, type BlobStore, type StoredBlob } from './store';

const isMissing = (error: unknown) => (error as NodeJS.ErrnoException).code === 'ENOENT';

export class LocalBlobStore implements BlobStore {
  readonly location: string;

  constructor(private readonly root: string) {
    this.location = `folder ${root}`;
  }

  private pathOf(key: string) {
    return join(this.root, blobPath(key));
  }

  async has(key: string) {
    try {
      await stat(this.pathOf(key));
      return true;
    } catch (error) {
      if (isMissing(error)) return false;
      throw error;
    }
  }

  private async write(key: string, fill: (partial: string) => Promise<void>) {
    const target = this.pathOf(key);
    await mkdir(dirname(target), { recursive: true });
    const partial = `${target}.${randomUUID()}.part`;
    try {
      await fill(partial);
      await rename(partial, target);
    } catch (error) {
      await rm(partial, { force: true });
      throw error;
    }
  }

  put(key: string, body: Buffer) {
    return this.write(key, (partial) => writeFile(partial, body));
  }

  putFile(key: string, path: string) {
    return this.write(key, (partial) => copyFile(path, partial));
  }

  async open(key: string) {
    try {
      const handle = await open(this.pathOf(key));
      return handle.createReadStream();
    } catch (error) {
      if (isMissing(error)) throw new BlobMissingError(key);
      throw error;
    }
  }

  async remove(key: string) {
    await rm(this.pathOf(key), { force: true });
  }

  private async *entries() {
    let folders: string[];
    try {
      folders = await readdir(this.root);
    } catch (error) {
      if (isMissing(error)) return;
      throw error;
    }
    for (const folder of folders.filter((name) => /^[0-9a-f]{2}$/.test(name)).sort()) {
      for (const name of (await readdir(join(this.root, folder))).sort()) {
        const path = join(this.root, folder, name);
        try {
          yield { name, path, modifiedAt: (await stat(path)).mtime };
        } catch (error) {
          if (!isMissing(error)) throw error; // removed meanwhile
        }
      }
    }
  }

  async *list(): AsyncIterable<StoredBlob> {
    for await (const entry of this.entries()) if (isBlobKey(entry.name)) yield { key: entry.name, modifiedAt: entry.modifiedAt };
  }

  async removeLeftovers(before: Date) {
    let removed = 0;
    for await (const entry of this.entries()) {
      if (entry.name.endsWith('.part') && entry.modifiedAt < before) {
        await rm(entry.path, { force: true });
        removed += 1;
      }
    }
    return removed;
  }
}
