import { render } from '@testing-library/preact';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { useIdleLock } from '../../src/app/use-idle-lock.ts';

function Watcher({ minutes, onIdle }: { minutes: number; onIdle: () => void }) {
  useIdleLock(minutes, onIdle);
  return <p>charting</p>;
}

describe('the idle lock', () => {
  beforeEach(() => vi.useFakeTimers());
  afterEach(() => vi.useRealTimers());

  it('locks after the unit’s idle minutes with no touch', () => {
    const onIdle = vi.fn();
    render(<Watcher minutes={5} onIdle={onIdle} />);
    vi.advanceTimersByTime(5 * 60_000 - 1);
    expect(onIdle).not.toHaveBeenCalled();
    vi.advanceTimersByTime(1);
    expect(onIdle).toHaveBeenCalledTimes(1);
  });

  it('starts the count again at every touch or key press', () => {
    const onIdle = vi.fn();
    render(<Watcher minutes={2} onIdle={onIdle} />);
    vi.advanceTimersByTime(90_000);
    window.dispatchEvent(new Event('pointerdown'));
    vi.advanceTimersByTime(90_000);
    window.dispatchEvent(new KeyboardEvent('keydown', { key: '4' }));
    vi.advanceTimersByTime(119_000);
    expect(onIdle).not.toHaveBeenCalled();
    vi.advanceTimersByTime(1_000);
    expect(onIdle).toHaveBeenCalledTimes(1);
  });
});
