/** A notice names its kind once: the hidden word for screen readers is left out when the title already says it. */
import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { Notice } from '../../../src/components/notice.tsx';
import { RiskNotice } from '../../../src/components/risk-notice.tsx';

describe('Notice', () => {
  it('reads "Caution" once when its title is that word', () => {
    render(<Notice tone="caution" title="Caution">Phase moves are work on live equipment.</Notice>);
    expect(screen.getByText('Phase moves are work on live equipment.').parentElement!.textContent).toBe('CautionPhase moves are work on live equipment.');
  });

  it('still names its kind before a title that does not', () => {
    render(<Notice tone="error" title="The study was not saved.">Try again.</Notice>);
    expect(screen.getByRole('alert')).toHaveTextContent('Error: The study was not saved.Try again.');
  });

  it('names a revision\'s violations a warning, not an error of the page', () => {
    render(<RiskNotice risk={{ revision: 4, solved: true, violationCount: 2, warningCount: 0, worst: 'KITCHEN a-n: 134.4 V = 1.12 pu is above the limit', error: null }} />);
    const status = screen.getByRole('status');
    expect(status).toHaveTextContent('Warning: Revision 4 has 2 violations.');
    expect(status).not.toHaveTextContent('Error');
  });
});
