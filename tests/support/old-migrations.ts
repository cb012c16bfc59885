/** An older migration set, for upgrade tests (tests/api/migrat*.test.ts). */
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { migrationsFolder } from '@turnstone/db/migrate';

const tmp = () => process.env.TURNSTONE_TEST_TMP ?? tmpdir();

/** A migrations folder holding only the journal's entries up to `lastTag`. */
export function migrationsUpTo(lastTag: string): string {
  const dir = mkdtempSync(join(tmp(), 'old-migrations-'));
  mkdirSync(join(dir, 'meta'));
  const journal = JSON.parse(readFileSync(join(migrationsFolder, 'meta', '_journal.json'), 'utf8'));
  const upTo = journal.entries.findIndex((e: { tag: string }) => e.tag === lastTag);
  if (upTo < 0) throw new Error(`no migration ${lastTag}`);
  journal.entries = journal.entries.slice(0, upTo + 1);
  writeFileSync(join(dir, 'meta', '_journal.json'), JSON.stringify(journal));
  for (const e of journal.entries as Array<{ tag: string }>)
    copyFileSync(join(migrationsFolder, `${e.tag}.sql`), join(dir, `${e.tag}.sql`));
  return dir;
}
