import { render, screen } from '@testing-library/react';
import { claimStates } from '@shared/schemas/claim';
import { ClaimStateBadge } from './claim-state-badge';

describe('ClaimStateBadge', () => {
  it('shows the state as words', () => {
    render(<ClaimStateBadge state="in_review" />);
    expect(screen.getByText('In review')).toBeInTheDocument();
  });

  it('gives every state its own colour', () => {
    const classes = claimStates.map((s) => {
      const { container, unmount } = render(<ClaimStateBadge state={s} />);
      const cls = (container.firstElementChild as HTMLElement).className;
      unmount();
      return cls;
    });
    expect(new Set(classes).size).toBe(claimStates.length);
  });
});
