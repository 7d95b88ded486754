import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { renderWithRouter } from '@/testing/render';
import { CataloguePanel } from './catalogue-panel';

type Row = { id: string; code: string; active: boolean };
const rows: Row[] = [
  { id: 'a', code: 'AAA', active: true },
  { id: 'b', code: 'BBB', active: false },
];
const loaded = { isPending: false, isError: false, error: null, data: rows };

function panel(query: { isPending: boolean; isError: boolean; error: unknown; data: Row[] | undefined }) {
  return (
    <CataloguePanel<Row>
      title="Things"
      description="Some things."
      caption="Things"
      newLabel="New thing"
      newTitle="New thing form"
      editLabel={(r) => `Edit thing ${r?.code ?? ''}`}
      query={query}
      columns={[{ header: 'Code', cell: (r) => r.code }]}
      renderCreate={(done) => <button onClick={done}>create-form</button>}
      renderEdit={(r, done) => <button onClick={done}>edit-form {r.code}</button>}
    />
  );
}

describe('CataloguePanel', () => {
  it('lists the rows under the configured columns, with an Edit button a row named after it', () => {
    renderWithRouter(panel(loaded));
    const table = screen.getByRole('table', { name: 'Things' });
    expect(within(table).getAllByRole('columnheader').map((h) => h.textContent)).toEqual(['Code', 'Actions']);
    expect(within(table).getByRole('cell', { name: 'BBB' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Edit thing AAA' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Edit thing BBB' })).toBeInTheDocument();
  });

  it('opens the edit form for the chosen row and the create form from the New button, and closes when the form is done', async () => {
    const user = userEvent.setup();
    renderWithRouter(panel(loaded));
    await user.click(screen.getByRole('button', { name: 'Edit thing BBB' }));
    expect(screen.getByRole('dialog', { name: 'Edit thing BBB' })).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'edit-form BBB' }));
    expect(screen.queryByRole('button', { name: 'edit-form BBB' })).not.toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'New thing' }));
    expect(screen.getByRole('dialog', { name: 'New thing form' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'create-form' })).toBeInTheDocument();
  });

  it('shows the load error instead of a table', () => {
    renderWithRouter(panel({ isPending: false, isError: true, error: new Error('The list could not be read'), data: undefined }));
    expect(screen.getByRole('alert')).toHaveTextContent('The list could not be read');
    expect(screen.queryByRole('table')).not.toBeInTheDocument();
  });
});
