// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render, screen } from '@testing-library/react';
import { UnreadyPage } from '../../../web/components/ui/page';
import { ListHead } from '../../../web/components/ui/table-head';

afterEach(cleanup);

describe('UnreadyPage', () => {
  it('when the record is still loading, then the page has the loading title and says so', () => {
    render(<UnreadyPage query={{ isPending: true, error: null }} title="Campaign" missingTitle="Campaign not found" missing="gone?" />);
    expect(screen.getByRole('heading', { level: 1 }).textContent).toBe('Campaign');
    expect(screen.getByText('Loading…')).toBeTruthy();
    expect(screen.queryByText('gone?')).toBeNull();
  });

  it('when the record cannot be read, then the page has the not-found title, the reason and what it may mean', () => {
    render(
      <UnreadyPage
        query={{ isPending: false, error: new Error('No such campaign.') }}
        title="Campaign"
        missingTitle="Campaign not found"
        missing="gone?"
      />,
    );
    expect(screen.getByRole('heading', { level: 1 }).textContent).toBe('Campaign not found');
    expect(screen.getByText('No such campaign.')).toBeTruthy();
    expect(screen.getByText('gone?')).toBeTruthy();
    expect(screen.queryByText('Loading…')).toBeNull();
  });
});

describe('ListHead', () => {
  it('when a column is hidden, then its name is for screen readers only and the last column has no end padding', () => {
    render(
      <table>
        <ListHead columns={[{ label: 'Name' }, { label: 'Members', align: 'right' }, { label: 'Links', hidden: true }]} />
      </table>,
    );
    const headers = screen.getAllByRole('columnheader');
    expect(headers.map((h) => h.textContent)).toEqual(['Name', 'Members', 'Links']);
    expect(headers[1]!.className).toBe('py-2 pr-3 text-right font-semibold');
    expect(headers[2]!.className).toBe('py-2 font-semibold');
    expect(headers[2]!.querySelector('.sr-only')?.textContent).toBe('Links');
  });

  it('when the list is compact, then the header uses the smaller padding and weight', () => {
    render(
      <table>
        <ListHead density="compact" columns={[{ label: 'File', align: 'left' }, { label: 'SHA-256' }]} />
      </table>,
    );
    expect(screen.getAllByRole('columnheader').map((h) => h.className)).toEqual([
      'py-1.5 pr-3 text-left font-medium',
      'py-1.5 font-medium',
    ]);
  });
});
