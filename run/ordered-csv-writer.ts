/**
 * all.csv in index order: the rows of a finished batch wait until every earlier batch is written, so
 * the file is the same whatever order the workers finish in. Its byte length and the waiting rows go
 * into the checkpoint; a resumed run truncates the file to that length and carries on.
 */
import { closeSync, existsSync, fsyncSync, ftruncateSync, openSync, writeSync } from 'node:fs';
import { must } from '../core/must.ts';
import { toDiskError } from './durable/disk-error.ts';

export class OrderedCsvWriter {
  private fd: number;
  private nextBatch = 0;
  private readonly pending = new Map<number, string>();
  bytes = 0;
  constructor(
    private readonly path: string,
    header: string | null,
    startBytes: number,
    startPending: Record<string, string>,
  ) {
    this.fd = openSync(path, existsSync(path) ? 'r+' : 'w+');
    ftruncateSync(this.fd, startBytes);
    this.bytes = startBytes;
    for (const [batch, text] of Object.entries(startPending)) this.pending.set(Number(batch), text);
    if (startBytes === 0 && header !== null) this.write(header);
    this.nextBatch = 0;
  }
  private write(text: string): void {
    const buffer = Buffer.from(text, 'utf8');
    try {
      writeSync(this.fd, buffer, 0, buffer.length, this.bytes);
    } catch (error) {
      throw toDiskError(error, this.path, 'write');
    }
    this.bytes += buffer.length;
  }
  /** Marks where writing resumes: the first batch not yet written. */
  setNext(batch: number): void {
    this.nextBatch = batch;
  }
  add(batch: number, text: string): void {
    this.pending.set(batch, text);
    this.flush();
  }
  private flush(): void {
    while (this.pending.has(this.nextBatch)) {
      this.write(must(this.pending.get(this.nextBatch)));
      this.pending.delete(this.nextBatch);
      this.nextBatch++;
    }
  }
  /** Batches done but not written yet (for the checkpoint). */
  pendingTexts(): Record<string, string> {
    return Object.fromEntries([...this.pending].map(([batch, text]) => [String(batch), text]));
  }
  sync(): void {
    try {
      fsyncSync(this.fd);
    } catch (error) {
      throw toDiskError(error, this.path, 'sync');
    }
  }
  close(): void {
    this.sync();
    closeSync(this.fd);
  }
  get writtenBatches(): number {
    return this.nextBatch;
  }
}
