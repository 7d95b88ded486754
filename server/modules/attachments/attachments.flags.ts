import { and, eq, inArray, isNotNull, ne } from 'drizzle-orm';
import { subject } from '@casl/ability';
import type { Db } from '../../db/client';
import type { AppAbility } from '@shared/permissions/ability';
import { attachments, claimReadings, claims, readingSpecs, sites, units } from '../../db/schema/index';
import { haversineKm } from '@shared/calculations/travel';
import { attachmentRoleLabels, type AttachmentRole } from '@shared/schemas/claim';
import { exifLocalDate } from '../../lib/photo/exif';
import { hammingDistance } from '../../lib/photo/hashes';
import { judgeReadings } from '../readings/readings.judge';

/**
 * Two photos are "nearly identical" when their 64-bit perceptual hashes differ in at most this
 * many bits. Measured on 30 generated scenes (the fixtures of tests/server/attachments-flags.test.ts):
 * their copies re-encoded at JPEG quality 55 and 25, resized to 60, 50, 40 and 25 % and saved as
 * JPEG, PNG or WebP differed by at most 3 bits; the 435 pairs of unrelated scenes by at least 20
 * (median 32). 10 sits between, with room on both sides.
 */
export const PHASH_MAX_DISTANCE = 10;
/** A photo taken more than this many days after the repair date is outside the service window. */
export const DAYS_AFTER_REPAIR = 7;
/** A photo taken more than this far from the site's coordinates is flagged (GPS in a building
 * is often off by a few hundred metres; 2 km leaves room for that and a large lot). */
export const FAR_FROM_SITE_KM = 2;

export type EvidenceFlagCode = 'photo_reused' | 'photo_reused_other_agency' | 'photo_outside_service_window' | 'photo_far_from_site' | 'readings_out_of_tolerance';

export interface EvidenceFlag {
  code: EvidenceFlagCode;
  message: string;
  attachmentId?: string;
  readingKey?: string;
  /** For photo_reused: the other claim. */
  otherClaimId?: string;
  otherClaimNumber?: string;
}

function addDays(date: string, days: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

function describe(a: { originalName: string; role: string }): string {
  const role = (attachmentRoleLabels as Record<string, string>)[a.role as AttachmentRole] ?? a.role;
  return `Photo "${a.originalName}" (${role.toLowerCase()})`;
}

export interface EvidenceFlagOptions {
  /**
   * The manufacturer's view: also compare with other agencies' claims (photo_reused_other_agency).
   * Left out, only the claim's own agency is searched, and nothing about other agencies is said.
   */
  revealOtherAgencies?: boolean;
}

/** Flags on a claim row that only the manufacturer's users see. */
export const MANUFACTURER_ONLY_FLAGS: readonly string[] = ['photo_reused_other_agency'];

/**
 * Whether this user sees across agencies (the manufacturer's roles read every agency; an agency
 * user reads only its own), from the same CASL rules that scope every query.
 */
export function seesEveryAgency(ability: AppAbility): boolean {
  return ability.can('read', subject('Agency', { id: '' }));
}

/** The claim row's flags as this user may see them. */
export function flagsForViewer(ability: AppAbility, flags: string[]): string[] {
  return seesEveryAgency(ability) ? flags : flags.filter((f) => !MANUFACTURER_ONLY_FLAGS.includes(f));
}

/**
 * The evidence checks that help the reviewer, each with its reason: a photo reused from another
 * claim (same SHA-256, or a perceptual hash within PHASH_MAX_DISTANCE bits), taken outside the
 * service window (EXIF capture date, read in its own offset, before the failure date or more
 * than DAYS_AFTER_REPAIR days after the repair date), taken far from the site (EXIF GPS more
 * than FAR_FROM_SITE_KM km, haversine), and after-repair readings out of tolerance.
 * Reads only; no access check (the caller has read the claim).
 */
export function evidenceFlags(db: Db, claimId: string, opts: EvidenceFlagOptions = {}): EvidenceFlag[] {
  const claim = db.select().from(claims).where(eq(claims.id, claimId)).get();
  if (!claim) return [];
  const flags: EvidenceFlag[] = [];
  const mine = db.select().from(attachments).where(eq(attachments.claimId, claimId)).orderBy(attachments.createdAt, attachments.id).all();
  const photos = mine.filter((a) => a.contentType.startsWith('image/'));

  // ---- reuse
  // The agency's view compares with its own claims only: whether another agency holds the same
  // picture is the manufacturer's to know (it would tell one agency about another's work).
  const manufacturerView = opts.revealOtherAgencies === true;
  const sameAgency = eq(claims.agencyId, claim.agencyId);
  type Hit = { claimId: string; number: string; agencyId: string };
  const reuse = (p: (typeof photos)[number], code: 'photo_reused' | 'photo_reused_other_agency', hit: Hit, how: string) =>
    flags.push({
      code,
      attachmentId: p.id,
      otherClaimId: hit.claimId,
      otherClaimNumber: hit.number,
      message: `${describe(p)} ${how} a photo on claim ${hit.number}${code === 'photo_reused_other_agency' ? ' of another agency' : ''}.`,
    });
  const flagged = new Set<string>();
  const shas = [...new Set(photos.map((p) => p.sha256))];
  if (shas.length > 0) {
    const same = db
      .select({ sha256: attachments.sha256, claimId: claims.id, number: claims.number, agencyId: claims.agencyId })
      .from(attachments)
      .innerJoin(claims, eq(claims.id, attachments.claimId))
      .where(and(inArray(attachments.sha256, shas), ne(attachments.claimId, claimId), manufacturerView ? undefined : sameAgency))
      .orderBy(claims.createdAt)
      .all();
    for (const p of photos) {
      const own = same.find((s) => s.sha256 === p.sha256 && s.agencyId === claim.agencyId);
      const other = manufacturerView ? same.find((s) => s.sha256 === p.sha256 && s.agencyId !== claim.agencyId) : undefined;
      if (own) reuse(p, 'photo_reused', own, 'is the same file (identical SHA-256) as');
      if (other) reuse(p, 'photo_reused_other_agency', other, 'is the same file (identical SHA-256) as');
      if (own || other) flagged.add(p.id);
    }
  }
  const hashed = photos.filter((p) => p.perceptualHash && !flagged.has(p.id));
  if (hashed.length > 0) {
    const others = db
      .select({ hash: attachments.perceptualHash, claimId: claims.id, number: claims.number, agencyId: claims.agencyId })
      .from(attachments)
      .innerJoin(claims, eq(claims.id, attachments.claimId))
      .where(and(isNotNull(attachments.perceptualHash), ne(attachments.claimId, claimId), manufacturerView ? undefined : sameAgency))
      .all();
    for (const p of hashed) {
      const best: Record<'own' | 'other', { d: number; o: (typeof others)[number] } | null> = { own: null, other: null };
      for (const o of others) {
        if (!o.hash || o.hash.length !== p.perceptualHash!.length) continue;
        const d = hammingDistance(p.perceptualHash!, o.hash);
        const k = o.agencyId === claim.agencyId ? 'own' : 'other';
        if (d <= PHASH_MAX_DISTANCE && (!best[k] || d < best[k]!.d)) best[k] = { d, o };
      }
      const how = (d: number) => `is nearly identical (perceptual hashes differ in ${d} of 64 bits; at most ${PHASH_MAX_DISTANCE} counts as the same picture) to`;
      if (best.own) reuse(p, 'photo_reused', best.own.o, how(best.own.d));
      if (best.other) reuse(p, 'photo_reused_other_agency', best.other.o, how(best.other.d));
    }
  }

  // ---- service window
  if (claim.failureDate || claim.repairDate) {
    const latest = claim.repairDate ? addDays(claim.repairDate, DAYS_AFTER_REPAIR) : null;
    for (const p of photos) {
      const day = exifLocalDate(p.takenAtRaw);
      if (!day) continue;
      const when = `${p.takenAtRaw}${p.takenAtOffset ? ` (UTC${p.takenAtOffset})` : ' (no UTC offset recorded)'}`;
      if (claim.failureDate && day < claim.failureDate) {
        flags.push({ code: 'photo_outside_service_window', attachmentId: p.id, message: `${describe(p)} was taken ${when}, before the failure date ${claim.failureDate}.` });
      } else if (latest && day > latest) {
        flags.push({
          code: 'photo_outside_service_window',
          attachmentId: p.id,
          message: `${describe(p)} was taken ${when}, more than ${DAYS_AFTER_REPAIR} days after the repair date ${claim.repairDate}.`,
        });
      }
    }
  }

  // ---- distance from the site
  const siteId = claim.siteId ?? (claim.unitId ? db.select({ siteId: units.siteId }).from(units).where(eq(units.id, claim.unitId)).get()?.siteId : null);
  const site = siteId ? db.select({ name: sites.name, latitude: sites.latitude, longitude: sites.longitude }).from(sites).where(eq(sites.id, siteId)).get() : undefined;
  if (site) {
    for (const p of photos) {
      if (p.gpsLatitude === null || p.gpsLongitude === null) continue;
      const km = haversineKm({ lat: p.gpsLatitude, lon: p.gpsLongitude }, { lat: site.latitude, lon: site.longitude });
      if (km > FAR_FROM_SITE_KM) {
        flags.push({
          code: 'photo_far_from_site',
          attachmentId: p.id,
          message: `${describe(p)} was taken ${km < 10 ? km.toFixed(1) : Math.round(km)} km from the site ${site.name} (more than ${FAR_FROM_SITE_KM} km, by its GPS position).`,
        });
      }
    }
  }

  // ---- readings
  const modelId = claim.unitId ? db.select({ modelId: units.modelId }).from(units).where(eq(units.id, claim.unitId)).get()?.modelId : undefined;
  if (modelId) {
    const specs = db.select().from(readingSpecs).where(eq(readingSpecs.modelId, modelId)).all();
    const rows = db.select().from(claimReadings).where(eq(claimReadings.claimId, claimId)).all();
    for (const j of judgeReadings(specs, rows)) {
      if (j.failsAfterRepair) flags.push({ code: 'readings_out_of_tolerance', readingKey: j.key, message: j.explanation });
    }
  }
  return flags;
}
