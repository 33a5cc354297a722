import { fireEvent, render, screen } from '@testing-library/preact';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { UpdateNotice } from '../../src/app/components/UpdateNotice.tsx';
import { registerOpenReadForm } from '../../src/app/open-read-form.ts';
import { simulateWaitingUpdateForTest, updateState } from '../../src/app/sw-bridge.ts';

function fakeWorker(order: string[]) {
  return { addEventListener: vi.fn(), messageSkipWaiting: vi.fn(() => order.push('skip-waiting')) };
}

describe('the update prompt', () => {
  afterEach(() => simulateWaitingUpdateForTest(null));

  it('says nothing while no new version waits', () => {
    render(<UpdateNotice />);
    expect(screen.queryByText(/update is ready/)).toBeNull();
  });

  it('applies a waiting version when the nurse agrees, saving the open draft first', async () => {
    const order: string[] = [];
    const worker = fakeWorker(order);
    const unregister = registerOpenReadForm({ flush: async () => void order.push('draft-saved'), hasTyping: () => false });
    simulateWaitingUpdateForTest(worker);
    render(<UpdateNotice />);
    expect(screen.getByText('An update is ready.')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Apply update' }));
    await screen.findByText(/Updating/);
    expect(order).toEqual(['draft-saved', 'skip-waiting']);
    unregister();
  });

  it('never takes over under a read being typed: it offers to apply after signing, then does so', async () => {
    const order: string[] = [];
    const worker = fakeWorker(order);
    const unregister = registerOpenReadForm({ flush: async () => void order.push('draft-saved'), hasTyping: () => true });
    simulateWaitingUpdateForTest(worker);
    render(<UpdateNotice />);
    fireEvent.click(screen.getByRole('button', { name: 'Apply update' }));
    fireEvent.click(await screen.findByRole('button', { name: 'Apply after signing' }));
    expect(worker.messageSkipWaiting).not.toHaveBeenCalled();
    expect(updateState()).toBe('after-signing');
    expect(screen.getByText(/applied when this read is signed or left/)).toBeTruthy();
    unregister();
    await vi.waitFor(() => expect(worker.messageSkipWaiting).toHaveBeenCalledTimes(1));
  });
});
