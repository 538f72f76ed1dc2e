// @vitest-environment happy-dom
import { useState } from 'react';
import { afterEach, describe, expect, it } from 'vitest';
import { act, cleanup, fireEvent, render, screen } from '@testing-library/react';
import { SignConvention } from '../../../web/components/ui/sign-convention';
import { CautionScope, SafetyCaution } from '../../../web/components/ui/caution';

afterEach(cleanup);

describe('SignConvention', () => {
  it('when the help button is pressed, then the explanation opens and aria-expanded says so; Escape closes it and focus stays on the button', () => {
    render(<SignConvention />);
    const button = screen.getByRole('button', { name: 'About the sign convention' });
    const panel = document.getElementById(button.getAttribute('aria-controls') ?? '');
    expect(panel).not.toBeNull();
    expect(button.getAttribute('aria-expanded')).toBe('false');
    expect(panel?.hidden).toBe(true);

    fireEvent.click(button);
    expect(button.getAttribute('aria-expanded')).toBe('true');
    expect(panel?.hidden).toBe(false);
    expect(panel?.textContent).toContain('opposite sign');

    button.focus();
    fireEvent.keyDown(button, { key: 'Escape' });
    expect(button.getAttribute('aria-expanded')).toBe('false');
    expect(panel?.hidden).toBe(true);
    expect(document.activeElement).toBe(button);
  });

  it('when the explanation is open and the user presses elsewhere, then it closes', () => {
    render(
      <div>
        <SignConvention />
        <p>elsewhere</p>
      </div>,
    );
    const button = screen.getByRole('button', { name: 'About the sign convention' });
    fireEvent.click(button);
    expect(button.getAttribute('aria-expanded')).toBe('true');
    fireEvent.pointerDown(screen.getByText('elsewhere'));
    expect(button.getAttribute('aria-expanded')).toBe('false');
  });

  it('when rendered, then the one-line summary states B minus A and which product a positive value favours', () => {
    render(<SignConvention />);
    expect(document.body.textContent).toContain('ΔΔX‡ = X‡(TS→B) − X‡(TS→A); positive favours A');
  });
});

describe('SafetyCaution on a page', () => {
  it('when three panels on one page each carry a caution, then it shows once, beside the last to appear', () => {
    render(
      <CautionScope>
        <section aria-label="forecast">
          <SafetyCaution />
        </section>
        <section aria-label="saved">
          <SafetyCaution compact />
        </section>
        <section aria-label="plan">
          <SafetyCaution compact />
        </section>
      </CautionScope>,
    );
    expect(screen.getAllByRole('note', { name: 'Safety caution' })).toHaveLength(1);
    expect(screen.getByRole('region', { name: 'plan' }).querySelector('[aria-label="Safety caution"]')).not.toBeNull();
  });

  it('when a newer result appears, then the caution moves to it; when that result goes away, it moves back', () => {
    function Harness() {
      const [shown, setShown] = useState(false);
      return (
        <CautionScope>
          <section aria-label="plan">
            <SafetyCaution compact />
          </section>
          <section aria-label="forecast">{shown && <SafetyCaution />}</section>
          <button onClick={() => setShown((s) => !s)}>toggle</button>
        </CautionScope>
      );
    }
    render(<Harness />);
    const inPlan = () => screen.getByRole('region', { name: 'plan' }).querySelector('[aria-label="Safety caution"]');
    const inForecast = () => screen.getByRole('region', { name: 'forecast' }).querySelector('[aria-label="Safety caution"]');
    expect(inPlan()).not.toBeNull();

    act(() => fireEvent.click(screen.getByText('toggle')));
    expect(inForecast()).not.toBeNull();
    expect(inPlan()).toBeNull();
    expect(screen.getAllByRole('note', { name: 'Safety caution' })).toHaveLength(1);

    act(() => fireEvent.click(screen.getByText('toggle')));
    expect(inPlan()).not.toBeNull();
    expect(screen.getAllByRole('note', { name: 'Safety caution' })).toHaveLength(1);
  });

  it('when a caution is rendered outside any page scope, then it shows', () => {
    render(<SafetyCaution />);
    expect(screen.getByRole('note', { name: 'Safety caution' }).textContent).toContain('calorimetry');
  });
});
