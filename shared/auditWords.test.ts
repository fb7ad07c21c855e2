import { describe, expect, it } from 'vitest';
import { actionWords, changedFields, fieldWords, recordTypeWords, valueWords } from './auditWords';
import { wordsOf } from './format';

describe('the audit trail in words', () => {
  it('names record types and actions in words, never by their codes', () => {
    expect(recordTypeWords('purchase-order')).toBe('Purchase order');
    expect(recordTypeWords('nonconformance')).toBe('NCR');
    expect(actionWords('disposition.use-as-is')).toBe('Lot decision signed: use as is (deviation)');
    expect(actionWords('stock.ship-to-vendor')).toBe('Stock move: shipped back to vendor');
    expect(actionWords('ncr.disposition.scrap')).toBe('NCR disposition signed: scrap');
    // An action recorded by a newer version still reads as words.
    expect(actionWords('calibration.certificate-added')).toBe('Calibration certificate added');
  });

  it('turns field codes into words', () => {
    expect(wordsOf('supplierLot')).toBe('Supplier lot');
    expect(wordsOf('ship_to_vendor')).toBe('Ship to vendor');
    expect(fieldWords('partId')).toBe('Part');
    expect(fieldWords('aql')).toBe('AQL');
    expect(fieldWords('0')).toBe('no. 1');
  });

  it('writes values as people read them', () => {
    expect(valueWords(true)).toBe('yes');
    expect(valueWords(null)).toBe('—');
    expect(valueWords(['HW-1', 'HW-2'])).toBe('HW-1, HW-2');
    expect(valueWords('2026-12-02T08:05:00.000Z')).toBe('2026-12-02 08:05 UTC');
    expect(valueWords('2026-12-02')).toBe('2026-12-02');
  });
});

describe('a change as a field-by-field difference', () => {
  // 21 CFR 11.10(e): an audit trail records changes so that previously recorded information is not
  // obscured; the page shows each changed field's earlier value beside its new one.
  it('lists only the fields that changed, with the value before and after', () => {
    const before = { name: 'Kestrel Optics', email: 'qa@kestrel.example', active: true, leadTimeDays: 20 };
    const after = { name: 'Kestrel Optics', email: 'quality@kestrel.example', active: false, leadTimeDays: 20 };
    expect(changedFields(before, after)).toEqual([
      { path: 'email', label: 'Email', before: 'qa@kestrel.example', after: 'quality@kestrel.example' },
      { path: 'active', label: 'Active', before: 'yes', after: 'no' },
    ]);
  });

  it('follows nested records and lists of records by position', () => {
    const before = { spec: { aql: 1, retardanceTolWaves: 0.005 }, lines: [{ quantity: 10 }, { quantity: 4 }] };
    const after = { spec: { aql: 0.65, retardanceTolWaves: 0.005 }, lines: [{ quantity: 12 }, { quantity: 4 }, { quantity: 3 }] };
    expect(changedFields(before, after)).toEqual([
      { path: 'spec.aql', label: 'Spec › AQL', before: '1', after: '0.65' },
      { path: 'lines.0.quantity', label: 'Lines › no. 1 › Quantity', before: '10', after: '12' },
      { path: 'lines.2.quantity', label: 'Lines › no. 3 › Quantity', before: '—', after: '3' },
    ]);
  });

  it('shows a record created as every field from nothing, and one removed the other way', () => {
    expect(changedFields(null, { number: 'DC-7', active: true })).toEqual([
      { path: 'number', label: 'Number', before: '—', after: 'DC-7' },
      { path: 'active', label: 'Active', before: '—', after: 'yes' },
    ]);
    expect(changedFields({ serials: ['A-1', 'A-2'] }, null)).toEqual([{ path: 'serials', label: 'Serials', before: 'A-1, A-2', after: '—' }]);
  });

  it('answers nothing when nothing changed', () => {
    expect(changedFields({ a: [1, 2] }, { a: [1, 2] })).toEqual([]);
    expect(changedFields(null, null)).toEqual([]);
  });
});
