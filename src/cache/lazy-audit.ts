import { deserialize, serialize } from "node:v8";
import type { ObjectAudit, Status } from "../audit/types.js";

/**
 * An object audit read back from the build cache, deserialised only when
 * something reads more of it than what the shared pages need of every object.
 *
 * A rebuild after one record changed needs little of the other nine thousand
 * nine hundred and ninety-nine audits: their pages are kept, the shared
 * downloads are assembled from their fragments and from the bytes of the last
 * full audit JSON, and the counts need only their statuses. So the cache keeps
 * each audit as its serialised bytes beside a small summary, and a read gives
 * a stand-in that answers id, name, file and status from the summary and
 * deserialises the audit the first time anything else is asked of it (every
 * property, key and descriptor then comes from the real audit). The bytes
 * themselves are read from the cache only then, or when the cache shard that
 * holds them is written again, which reuses them as they are.
 */

export interface AuditSummary {
  readonly id: string;
  readonly name: string;
  readonly file: string;
  readonly status: Status;
  /** The status of each measurement, in order. */
  readonly statuses: readonly Status[];
}

/** An audit as the cache stores it: a summary, and its serialised bytes (kept apart, read on demand). */
export interface StoredAudit {
  readonly summary: AuditSummary;
  readonly bytes: Uint8Array;
}

interface Lazy {
  readonly summary: AuditSummary;
  readonly read: () => Uint8Array;
  /** The bytes can be read again whenever asked (a file that stays), so they are not kept. */
  readonly rereadable: boolean;
  bytes?: Uint8Array;
  real?: ObjectAudit;
}

/** Stand-ins, one map per process (a registered symbol), shared by the compiled code and the sources alike. */
const LAZIES = Symbol.for("steelyard.cache.lazy-audits");
const holder = globalThis as { [LAZIES]?: WeakMap<object, Lazy> };
const lazies = (holder[LAZIES] ??= new WeakMap<object, Lazy>());

const FROM_SUMMARY = new Set<PropertyKey>(["id", "name", "file", "status"]);

export function summaryOf(obj: ObjectAudit): AuditSummary {
  const lazy = lazies.get(obj);
  if (lazy) return lazy.summary;
  return { id: obj.id, name: obj.name, file: obj.file, status: obj.status, statuses: obj.measurements.map((m) => m.status) };
}

function bytesOf(lazy: Lazy): Uint8Array {
  if (lazy.bytes !== undefined) return lazy.bytes;
  const bytes = lazy.read();
  if (!lazy.rereadable) lazy.bytes = bytes;
  return bytes;
}

/** The audit as the cache stores it: a stand-in never opened gives back its own bytes (read now if need be). */
export function storeAudit(obj: ObjectAudit): StoredAudit {
  const lazy = lazies.get(obj);
  if (lazy) return { summary: lazy.summary, bytes: bytesOf(lazy) };
  return { summary: summaryOf(obj), bytes: serialize(obj) };
}

/**
 * The stand-in for a stored audit whose bytes `read` gives (see the module
 * comment). Bytes read from a file that may go (a cache shard's blobs, which
 * a rewrite of the shard replaces) are kept once read; with `rereadable`
 * they are read afresh each time, and never held.
 */
export function lazyAudit(summary: AuditSummary, read: () => Uint8Array, rereadable = false): ObjectAudit {
  const lazy: Lazy = { summary, read, rereadable };
  const real = (): ObjectAudit => (lazy.real ??= deserialize(bytesOf(lazy)) as ObjectAudit);
  const fields = summary as unknown as Record<PropertyKey, unknown>;
  const stand = new Proxy({} as ObjectAudit, {
    get: (_t, p) => (lazy.real === undefined && FROM_SUMMARY.has(p) ? fields[p] : Reflect.get(real(), p)),
    has: (_t, p) => Reflect.has(real(), p),
    ownKeys: () => Reflect.ownKeys(real()),
    getOwnPropertyDescriptor: (_t, p) => {
      const d = Reflect.getOwnPropertyDescriptor(real(), p);
      // the stand-in's own target has no properties: a descriptor must be configurable to be reported
      return d === undefined ? undefined : { ...d, configurable: true };
    },
    set: () => {
      throw new TypeError("an audit read from the cache cannot be changed");
    },
    defineProperty: () => {
      throw new TypeError("an audit read from the cache cannot be changed");
    },
    deleteProperty: () => {
      throw new TypeError("an audit read from the cache cannot be changed");
    },
  });
  lazies.set(stand, lazy);
  return stand;
}

/** True when `obj` is a stand-in whose audit has been deserialised, false for one not yet, undefined for a plain audit. */
export function isOpened(obj: ObjectAudit): boolean | undefined {
  const lazy = lazies.get(obj);
  return lazy === undefined ? undefined : lazy.real !== undefined;
}

/** The real audit behind a stand-in (deserialised now if need be), or the object itself; for passing it to another thread. */
export function realAudit(obj: ObjectAudit): ObjectAudit {
  const lazy = lazies.get(obj);
  if (!lazy) return obj;
  return (lazy.real ??= deserialize(bytesOf(lazy)) as ObjectAudit);
}

/**
 * JSON.stringify(obj); for a stand-in not opened yet, from a copy that is
 * dropped at once, so that writing every audit out does not leave every
 * audit deserialised.
 */
export function auditJsonText(obj: ObjectAudit): string {
  const lazy = lazies.get(obj);
  if (!lazy || lazy.real !== undefined) return JSON.stringify(obj);
  return JSON.stringify(deserialize(bytesOf(lazy)));
}
