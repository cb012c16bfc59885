import { customType } from 'drizzle-orm/mysql-core';

/**
 * JSON stored as MariaDB JSON (a LONGTEXT alias with a json_valid check). mysql2 hands
 * MariaDB's JSON back as a string, so parse on the way out; MySQL would give an object.
 */
export const jsonColumn = <T>(name: string) =>
  customType<{ data: T; driverData: string }>({
    dataType: () => 'json',
    toDriver: (value) => JSON.stringify(value),
    fromDriver: (value) => (typeof value === 'string' ? JSON.parse(value) : value) as T,
  })(name);

/**
 * A JSON column stored with MariaDB's column compression (`COMPRESSED`: zlib, values over
 * `column_compression_threshold`, 100 bytes by default), for per-capture JSON kept for ever;
 * read and written like {@link jsonColumn}.
 */
export const compressedJsonColumn = <T>(name: string) =>
  customType<{ data: T; driverData: string }>({
    dataType: () => 'json COMPRESSED',
    toDriver: (value) => JSON.stringify(value),
    fromDriver: (value) => (typeof value === 'string' ? JSON.parse(value) : value) as T,
  })(name);

/** Binary payloads (compressed samples, float32 spectra): up to 16 MiB. */
export const mediumBlob = (name: string) =>
  customType<{ data: Buffer; driverData: Buffer }>({
    dataType: () => 'mediumblob',
    toDriver: (value) => value,
    fromDriver: (value) => value,
  })(name);
