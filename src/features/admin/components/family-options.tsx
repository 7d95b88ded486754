import { useFamilies } from '../api/get-families';

/** The product families as <option>s, after an optional first "no family" choice with an empty value. */
export function FamilyOptions({ blank }: { blank?: string }) {
  const families = useFamilies();
  return (
    <>
      {blank !== undefined && <option value="">{blank}</option>}
      {(families.data ?? []).map((f) => (
        <option key={f.id} value={f.id}>
          {f.code} · {f.name}
        </option>
      ))}
    </>
  );
}
