import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useForm } from 'react-hook-form';
import type { CatalogPart } from '@shared/schemas/catalog';
import type { ClaimFormValues } from '../form-model';
import { PartsSection } from './parts-section';

const part = (id: string, partNumber: string, description: string): CatalogPart => ({
  id,
  partNumber,
  description,
  familyId: 'fam-1',
  familyCode: 'FAM',
  listPriceCents: 1000,
  returnRequired: false,
  active: true,
});
const parts = [part('p-1', 'TP-100', 'Test element'), part('p-2', 'TP-200', 'Test thermostat'), part('p-3', 'TP-300', 'Test valve')];

function Harness() {
  const form = useForm<ClaimFormValues>({ defaultValues: { partLines: [] } as unknown as ClaimFormValues });
  return (
    <form>
      <PartsSection form={form} parts={parts} componentTerms={[]} currency="USD" />
      <button type="submit">Submit</button>
    </form>
  );
}

describe('parts search (combobox with a listbox of results)', () => {
  it('moves the active option with ArrowDown/ArrowUp through aria-activedescendant and adds it with Enter', async () => {
    const user = userEvent.setup();
    render(<Harness />);
    const box = screen.getByRole('combobox', { name: 'Add a part' });
    expect(box).toHaveAttribute('aria-expanded', 'false');
    await user.type(box, 'test');
    expect(box).toHaveAttribute('aria-expanded', 'true');
    const list = screen.getByRole('listbox', { name: 'Matching parts' });
    const options = within(list).getAllByRole('option');
    expect(options).toHaveLength(3);
    expect(box).not.toHaveAttribute('aria-activedescendant');

    await user.keyboard('{ArrowDown}');
    expect(box).toHaveAttribute('aria-activedescendant', options[0]!.id);
    expect(options[0]).toHaveAttribute('aria-selected', 'true');
    await user.keyboard('{ArrowDown}{ArrowDown}{ArrowDown}');
    // wraps from the last back to the first
    expect(box).toHaveAttribute('aria-activedescendant', options[0]!.id);
    await user.keyboard('{ArrowUp}');
    expect(box).toHaveAttribute('aria-activedescendant', options[2]!.id);
    expect(options[2]).toHaveAttribute('aria-selected', 'true');
    expect(options[0]).toHaveAttribute('aria-selected', 'false');

    await user.keyboard('{Enter}');
    const line = screen.getByRole('listitem', { name: 'Part line 1' });
    expect(within(line).getByText('TP-300')).toBeInTheDocument();
    expect(screen.queryByRole('listbox', { name: 'Matching parts' })?.children ?? []).toHaveLength(0);
  });

  it('moves focus to the new line’s quantity after a part is added, by keyboard or by pointer', async () => {
    const user = userEvent.setup();
    render(<Harness />);
    const box = screen.getByRole('combobox', { name: 'Add a part' });
    await user.type(box, 'TP-200');
    await user.keyboard('{ArrowDown}{Enter}');
    const first = screen.getByRole('listitem', { name: 'Part line 1' });
    expect(within(first).getByLabelText('Quantity')).toHaveFocus();

    await user.type(screen.getByRole('combobox', { name: 'Add a part' }), 'valve');
    await user.click(screen.getByRole('option', { name: /TP-300/ }));
    const second = screen.getByRole('listitem', { name: 'Part line 2' });
    expect(within(second).getByLabelText('Quantity')).toHaveFocus();
  });

  it('closes the list with Escape and never submits the claim form with Enter', async () => {
    const user = userEvent.setup();
    const submitted = vi.fn((e: SubmitEvent) => e.preventDefault());
    render(<Harness />);
    document.querySelector('form')!.addEventListener('submit', submitted);
    const box = screen.getByRole('combobox', { name: 'Add a part' });
    await user.type(box, 'test');
    await user.keyboard('{Escape}');
    expect(box).toHaveValue('');
    expect(box).toHaveAttribute('aria-expanded', 'false');
    expect(box).toHaveFocus();
    await user.type(box, 'nothing like this{Enter}');
    expect(submitted).not.toHaveBeenCalled();
    expect(screen.queryByRole('listitem', { name: /Part line/ })).not.toBeInTheDocument();
  });
});
