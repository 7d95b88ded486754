/**
 * The claim list page as hand-written SQL, kept in step with the app's list query for an
 * agency user: the same columns and joins (agency, technician, unit, model, site, reviewer),
 * the same filter (agency scope AND state), the same order (created_at, id, newest first), the
 * same two-step shape (the page's ids from the claims table alone, then the joins for those
 * rows), page size + 1 to know whether a next page exists, and the same count. The baseline
 * server runs it with nothing around it, so the ratio measures the app's own overhead.
 */
export const claimListPageSql = `
SELECT c.id, c.number, c.state, c.agency_id AS agencyId, o.name AS agencyName,
       c.technician_id AS technicianId, t.name AS technicianName, u.serial, m.model_number AS modelNumber,
       s.name AS siteName, c.failure_date AS failureDate, c.repair_date AS repairDate,
       c.submitted_at AS submittedAt, c.created_at AS createdAt, c.claimed_total_cents AS claimedTotalCents,
       c.approved_total_cents AS approvedTotalCents, c.currency, c.flags, r.name AS reviewerName
FROM claims c
JOIN organisations o ON o.id = c.agency_id
JOIN users t ON t.id = c.technician_id
LEFT JOIN units u ON u.id = c.unit_id
LEFT JOIN models m ON m.id = u.model_id
LEFT JOIN sites s ON s.id = c.site_id
LEFT JOIN users r ON r.id = c.reviewer_id
WHERE c.id IN (
  SELECT id FROM claims WHERE agency_id = ? AND state = ? ORDER BY created_at DESC, id DESC LIMIT ?
)
ORDER BY c.created_at DESC, c.id DESC`;

export const claimListCountSql = `SELECT count(*) AS n FROM claims WHERE agency_id = ? AND state = ?`;
