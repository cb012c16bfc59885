import { describe, expect, it } from 'vitest';
import { codeMigrations, isAdditive, OLDEST_SUPPORTED } from './migrate.ts';

// Which SQL loses stored data is common practice, no source: DROP, RENAME, a column's type
// or name changed, rows rewritten or deleted.
describe('isAdditive', () => {
  it('accepts statements that only add tables, indexes, columns, constraints or rows', () => {
    for (const sql of [
      'CREATE TABLE `mail_messages` (\n\t`id` bigint unsigned AUTO_INCREMENT NOT NULL\n);',
      'CREATE INDEX `audit_site_idx` ON `audit_log` (`site_id`,`id`);',
      'CREATE UNIQUE INDEX `x_uq` ON `x` (`a`);',
      "ALTER TABLE `snapshots` ADD `samples_codec` enum('deflate-raw','none') DEFAULT 'deflate-raw' NOT NULL;",
      'ALTER TABLE `alerts` ADD CONSTRAINT `alerts_point_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`);',
      // Keywords inside names and strings are not statements.
      "ALTER TABLE `users` ADD `dropped_at` datetime COMMENT 'DROP nothing';",
      "INSERT INTO `settings` (`key`, `value`) VALUES ('mail', '{}');",
      '-- a comment first\nCREATE TABLE `t` (`id` int);',
      // An index is rebuilt from the rows; dropping it loses no data.
      'DROP INDEX `x` ON `y`;',
      'ALTER TABLE `snapshots` DROP INDEX `snapshots_uid_uq`;',
      'ALTER TABLE `t` DROP INDEX `t_idx`, ADD INDEX `t_idx` (`a`,`b`,`c`);',
    ])
      expect({ sql, additive: isAdditive(sql) }).toEqual({ sql, additive: true });
  });

  it('counts everything else as destructive', () => {
    for (const sql of [
      'DROP TABLE `findings`;',
      'ALTER TABLE `users` DROP COLUMN `name`;',
      'ALTER TABLE `users` DROP INDEX `a`, DROP COLUMN `b`;',
      'ALTER TABLE `users` DROP INDEX `a`, ADD INDEX `a` (`b`), DROP COLUMN `b`;',
      'ALTER TABLE `users` DROP INDEX `a`, ADD INDEX `a` (`b`(10)) ALGORITHM=COPY;',
      'ALTER TABLE `users` ADD `x` int, DROP COLUMN `name`;',
      'ALTER TABLE `users` MODIFY `name` varchar(10);',
      'ALTER TABLE `users` CHANGE `name` `full_name` varchar(200);',
      'ALTER TABLE `users` RENAME COLUMN `name` TO `full_name`;',
      'RENAME TABLE `a` TO `b`;',
      "UPDATE `audit_log` SET `site_id` = 1 WHERE `entity` = 'site';",
      'DELETE FROM `snapshots` WHERE `id` < 10;',
      'TRUNCATE TABLE `jobs`;',
      "INSERT INTO `settings` VALUES ('a', 1) ON DUPLICATE KEY UPDATE `value` = 2;",
      'CREATE TABLE `t` (`id` int); DROP TABLE `u`;',
      'SET FOREIGN_KEY_CHECKS = 0;',
    ])
      expect({ sql, additive: isAdditive(sql) }).toEqual({ sql, additive: false });
  });
});

describe('codeMigrations', () => {
  it('reads the journal in order, from the oldest supported set on', () => {
    const all = codeMigrations();
    expect(all[0]!.tag).toBe(OLDEST_SUPPORTED);
    expect(all.map((m) => m.when)).toEqual([...all.map((m) => m.when)].sort((a, b) => a - b));
    // The audit log's backfill, the points' site backfill (tags unique per site: the global
    // tag index is dropped) and the monthly partitioning (foreign keys dropped, the three
    // capture tables rebuilt) and the bytes-per-capture step (thinned summaries trimmed, an
    // index dropped, JSON columns compressed) rewrite rows; the others only add.
    expect(all.filter((m) => m.destructive.length > 0).map((m) => m.tag)).toEqual([
      '0002_audit-site',
      '0009_point-tag-per-site',
      '0018_time-partitioning',
      '0021_bytes-per-capture',
    ]);
  });
});
