/**
 * Demo theatre lists (FICTIONAL, like every demo record): for each demo site, the operations of
 * its registry cases plus a few operations never abstracted (about 2% of cases, 8% in the last
 * three months: an abstraction backlog), so the capture page has something to show. Operations
 * of cases with a keyed hash carry that hash; the others carry a hash of a made-up identifier
 * and are matched by date and category. Deterministic (hashes of registry numbers).
 */
import { demoSeedSteps } from '../db/seed/steps.js';

demoSeedSteps.push({
  name: 'theatre lists',
  run: async (ds) => {
    await ds.transaction(async (tx) => {
      const [{ max }] = await tx.query(`SELECT max(surgery_date)::text AS max FROM surgical_cases`);
      if (!max) return;
      const uploads: { id: string; site_id: string }[] = await tx.query(
        `INSERT INTO theatre_list_uploads (site_id, file_hash, rows, from_date, to_date)
         SELECT site_id, 'demo', 0, min(surgery_date), max(surgery_date) FROM surgical_cases GROUP BY site_id RETURNING id, site_id`,
      );
      for (const u of uploads) {
        await tx.query(
          `INSERT INTO theatre_list_entries (upload_id, site_id, operation_date, procedure_category, identifier_hash)
           SELECT $1::uuid, c.site_id, c.surgery_date, c.procedure_category, COALESCE(c.identifier_hash, encode(sha256(convert_to('demo-list-' || c.registry_number, 'UTF8')), 'hex'))
             FROM surgical_cases c WHERE c.site_id = $2::uuid AND c.status <> 'withdrawn' AND c.procedure_category IS NOT NULL
           UNION ALL
           SELECT $1::uuid, c.site_id, c.surgery_date, c.procedure_category, encode(sha256(convert_to('demo-missing-' || c.registry_number, 'UTF8')), 'hex')
             FROM surgical_cases c WHERE c.site_id = $2::uuid AND c.procedure_category IS NOT NULL
              AND abs(hashtext(c.registry_number)) % 100 < CASE WHEN c.surgery_date > $3::date - 92 THEN 8 ELSE 2 END`,
          [u.id, u.site_id, max],
        );
        await tx.query(`UPDATE theatre_list_uploads SET rows = (SELECT count(*) FROM theatre_list_entries WHERE upload_id = $1) WHERE id = $1`, [u.id]);
      }
    });
  },
});
