/**
 * The claim list page as one hand-written statement: the same columns, joins, filter
 * (agency scope AND state), order (created_at, id, newest first) and page size + 1 as the app's
 * list query for an agency user, plus the same count. The baseline server runs it bare.
 */
export const claimListPageSql = `
SELECT c.id, c.number, c.state, c.agency_id AS agencyId, o.name AS agencyName,
       c.technician_id AS technicianId, t.name AS technicianName, u.serial, m.model_number AS modelNumber,
       s.name AS siteName, c.failure_date AS failureDate, c.repair_date AS repairDate,
       c.submitted_at AS submittedAt, c.created_at AS createdAt, c.claimed_total_cents AS claimedTotalCents,
       c.approved_total_cents AS approvedTotalCents, c.currency, c.flags
FROM claims c
JOIN organisations o ON o.id = c.agency_id
JOIN users t ON t.id = c.technician_id
LEFT JOIN units u ON u.id = c.unit_id
LEFT JOIN models m ON m.id = u.model_id
LEFT JOIN sites s ON s.id = c.site_id
WHERE c.agency_id = ? AND c.state = ?
ORDER BY c.created_at DESC, c.id DESC
LIMIT ?`;

export const claimListCountSql = `SELECT count(*) AS n FROM claims c WHERE c.agency_id = ? AND c.state = ?`;
