// @vitest-environment jsdom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import type { Issue } from '../../src/core/intake/types';
import { IssueList } from '../../src/taskpane/IssueList';
import { okOutput } from './fakes';

afterEach(cleanup);

/** `n` copies of the fake run's warning, each at its own row (invented cells). */
function warnings(n: number): Issue[] {
  const one = okOutput().issues[0];
  if (one === undefined) throw new Error('the fake output has no issue');
  return Array.from({ length: n }, (_, i) => ({ ...one, row: i + 2, cell: `Visits!G${i + 2}`, message: `Problem ${i + 1}` }));
}

describe('IssueList', () => {
  it('shows the first `limit` problems, and "Show all" reveals the rest with keyboard focus on the first revealed', () => {
    const onSelect = vi.fn();
    render(<IssueList issues={warnings(5)} onSelect={onSelect} limit={3} />);
    expect(screen.getAllByRole('listitem')).toHaveLength(3);
    fireEvent.click(screen.getByRole('button', { name: 'Show all 5 problems' }));
    expect(screen.getAllByRole('listitem')).toHaveLength(5);
    expect(screen.queryByRole('button', { name: /Show all/ })).toBeNull();
    expect(document.activeElement?.textContent).toContain('Problem 4');
    fireEvent.click(screen.getByRole('button', { name: 'Go to cell Visits!G6' }));
    expect(onSelect).toHaveBeenCalledWith('Visits!G6');
  });
});
