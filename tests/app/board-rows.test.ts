import { describe, expect, it } from 'vitest';
import { boardRows } from '../../src/app/board-rows.ts';
import { buildDemoWard } from '../../src/store/demo-ward.ts';
import { unitPolicyOf } from '../../src/store/unit-policy-of.ts';

const nowMs = Date.UTC(2026, 4, 12, 3, 10);
const ward = buildDemoWard(nowMs);
const stays = ward.stays.map((stay) => ({ stay, latestReads: ward.reads.filter((r) => r.stayId === stay.id).slice(-2), amendments: [] }));

describe('boardRows', () => {
  const rows = boardRows(ward.unit, ward.beds, stays, unitPolicyOf(ward.unit), new Set(['demo-stay-07']), nowMs);

  it('lists overdue and urgent beds first, then caution or due soon, then the rest, empty beds last', () => {
    const ranks = rows.map((r) => r.attentionRank);
    expect(ranks).toEqual([...ranks].sort((a, b) => a - b));
    expect(rows.slice(0, 3).map((r) => r.bed.label)).toEqual(['Bed 2', 'Bed 5', 'Bed 10']);
    expect(rows.at(-1)?.bed.label).toBe('Bed 9');
    expect(rows.at(-1)?.stay).toBeNull();
  });

  it('gives each bed its schedule, rhythm and the latest read’s flags', () => {
    const bed2 = rows.find((r) => r.bed.label === 'Bed 2')!;
    expect(bed2.flags[0]?.severity).toBe('urgent');
    expect(bed2.rhythmName).toBe('Sinus rhythm');
    const bed5 = rows.find((r) => r.bed.label === 'Bed 5')!;
    expect(bed5.schedule?.status).toBe('overdue');
    // Last read 6 h 15 min ago at q4h: overdue by 2 h 15 min (schedule rule: due interval after the last read).
    expect(bed5.schedule?.overdueByMs).toBe(2.25 * 3_600_000);
  });

  it('marks the beds where this nurse has a draft', () => {
    expect(rows.filter((r) => r.hasMyDraft).map((r) => r.bed.label)).toEqual(['Bed 7']);
  });

  it('leaves out beds taken out of use', () => {
    const fewer = boardRows(ward.unit, ward.beds.map((b) => (b.label === 'Bed 9' ? { ...b, active: false } : b)), stays, unitPolicyOf(ward.unit), new Set(), nowMs);
    expect(fewer.map((r) => r.bed.label)).not.toContain('Bed 9');
  });
});
