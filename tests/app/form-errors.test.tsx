import { render, screen } from '@testing-library/preact';
import { describe, expect, it } from 'vitest';
import { FormErrors } from '../../src/app/components/FormErrors.tsx';

describe('the form errors list', () => {
  it('shows nothing when the form has no errors', () => {
    const { container } = render(<FormErrors messages={[]} />);
    expect(container.innerHTML).toBe('');
    expect(screen.queryByRole('alert')).toBeNull();
  });

  it('announces every message as one alert, one item each, in order', () => {
    render(<FormErrors messages={['Name: type the name the team knows you by.', 'PIN: choose 4 to 8 digits.']} />);
    const alert = screen.getByRole('alert');
    expect(alert.tagName).toBe('UL');
    expect(alert.className).toBe('form-errors');
    expect([...alert.querySelectorAll('li')].map((li) => li.textContent)).toEqual(['Name: type the name the team knows you by.', 'PIN: choose 4 to 8 digits.']);
    expect(alert.hasAttribute('aria-label')).toBe(false);
  });

  it('keeps a repeated message twice and names the list when asked', () => {
    render(<FormErrors messages={['R-R count 1: too short.', 'R-R count 1: too short.']} label="Fix before signing" />);
    const alert = screen.getByRole('alert', { name: 'Fix before signing' });
    expect(alert.querySelectorAll('li')).toHaveLength(2);
  });
});
