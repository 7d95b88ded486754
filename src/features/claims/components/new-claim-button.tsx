import { ButtonLink } from '@/components/ui/button';
import { paths } from '@/config/paths';
import { useAppAbility } from '@/lib/ability';

/** "New claim", for those who may file one (service agency users). */
export function NewClaimButton({ className }: { className?: string }) {
  const ability = useAppAbility();
  if (!ability.can('create', 'Claim')) return null;
  return (
    <ButtonLink to={paths.claimNew} className={className}>
      <span aria-hidden="true">＋</span> New claim
    </ButtonLink>
  );
}
